package units

import (
	"reflect"
	"testing"
	"unsafe"
)

// The cache must keep its own copy of each spelling: callers such as the
// parser hand in strings that share a buffer they may reuse afterwards, and
// a key that changes under the map corrupts it (the runtime then panics on a
// later insert).
func TestCacheOwnsItsKeys(t *testing.T) {
	buf := []byte("mW/(cm2*K)")
	s := unsafe.String(unsafe.SliceData(buf), len(buf))
	want, err := Parse(s)
	if err != nil {
		t.Fatal(err)
	}
	copy(buf, "kg/(m2*s2)") // the caller reuses its buffer
	cache.Range(func(k, v any) bool {
		u, err := parse(k.(string))
		if err != nil || !reflect.DeepEqual(u, v.(Unit)) {
			t.Errorf("cache key %q holds %v, which is not its unit", k, v)
		}
		return true
	})
	if got, err := Parse("mW/(cm2*K)"); err != nil || !reflect.DeepEqual(got, want) {
		t.Errorf("Parse(mW/(cm2*K)) after the buffer changed = %v, %v; want %v", got, err, want)
	}
}
