package flow

import (
	"math"
	"reflect"
	"sync"
)

// sanitize replaces any NaN by 0 and ±Inf by ±MaxFloat64 in v (a pointer
// to a result struct) and returns how many it replaced, so that no
// non-finite number leaves the package whatever the input. Negative zeros
// become zeros (not counted).
func sanitize(v any) int {
	return walk(reflect.ValueOf(v))
}

func walk(v reflect.Value) int {
	switch v.Kind() {
	case reflect.Pointer, reflect.Interface:
		if v.IsNil() {
			return 0
		}
		return walk(v.Elem())
	case reflect.Struct:
		n := 0
		for _, i := range floatFields(v.Type()) {
			n += walk(v.Field(i))
		}
		return n
	case reflect.Slice, reflect.Array:
		if !holdsFloats(v.Type().Elem()) {
			return 0
		}
		n := 0
		for i := 0; i < v.Len(); i++ {
			n += walk(v.Index(i))
		}
		return n
	case reflect.Float64:
		f := v.Float()
		switch {
		case math.IsNaN(f):
			v.SetFloat(0)
			return 1
		case math.IsInf(f, 1):
			v.SetFloat(math.MaxFloat64)
			return 1
		case math.IsInf(f, -1):
			v.SetFloat(-math.MaxFloat64)
			return 1
		case f == 0 && math.Signbit(f):
			v.SetFloat(0) // a negative zero prints as "-0"
		}
	}
	return 0
}

// finishLoop sanitizes a loop result and records any replacement. It also
// drops each case's reference to the model, so a kept result holds names
// and numbers only and does not keep a whole model alive.
func finishLoop(lr *LoopResult) {
	for i := range lr.Cases {
		lr.Cases[i].pointCase = nil
	}
	if n := sanitize(lr); n > 0 {
		lr.Findings = append(lr.Findings, Finding{Rule: RuleNonFinite, Severity: "warning", Loop: lr.Loop,
			Value: float64(n), Message: "the estimate produced non-finite numbers, shown as 0 or the largest float; treat this loop's numbers with suspicion"})
	}
}

// fieldCache maps a struct type to the indices of its exported fields that
// can hold a float64: a result of thousands of component states is walked
// without asking reflection about every field of every one.
var fieldCache sync.Map // reflect.Type → []int

func floatFields(t reflect.Type) []int {
	if v, ok := fieldCache.Load(t); ok {
		return v.([]int)
	}
	var idx []int
	for i := 0; i < t.NumField(); i++ {
		if f := t.Field(i); f.IsExported() && holdsFloats(f.Type) {
			idx = append(idx, i)
		}
	}
	fieldCache.Store(t, idx)
	return idx
}

// holdsFloats reports whether a value of type t can contain a float64 that
// walk would visit. Interfaces and recursive types are assumed to.
func holdsFloats(t reflect.Type) bool {
	if v, ok := holdsCache.Load(t); ok {
		return v.(bool)
	}
	h := holds(t, map[reflect.Type]bool{})
	holdsCache.Store(t, h)
	return h
}

var holdsCache sync.Map // reflect.Type → bool

func holds(t reflect.Type, seen map[reflect.Type]bool) bool {
	switch t.Kind() {
	case reflect.Float64, reflect.Interface:
		return true
	case reflect.Pointer, reflect.Slice, reflect.Array:
		return holds(t.Elem(), seen)
	case reflect.Struct:
		if seen[t] {
			return true
		}
		seen[t] = true
		for i := 0; i < t.NumField(); i++ {
			if f := t.Field(i); f.IsExported() && holds(f.Type, seen) {
				return true
			}
		}
	}
	return false
}
