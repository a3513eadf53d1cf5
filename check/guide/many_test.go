package guide

import (
	"context"
	"fmt"
	"reflect"
	"strings"
	"testing"

	"circa/check/flow"
	"circa/lang"
)

// manyParams returns hand.loop with the orifice as a parameter, the
// downcomer's bore given through two parameters (dc_bore = dc_mm * 1 mm),
// and, before it all, n parameters no field names: chains of ten, each
// link naming the one before, so that they are named by expressions yet
// reach nothing.
func manyParams(t testing.TB, n int) *lang.Model {
	t.Helper()
	var b strings.Builder
	for i := 0; i < n; i++ {
		if i%10 == 0 {
			fmt.Fprintf(&b, "param inert%d = %d mm\n", i, i+1)
		} else {
			fmt.Fprintf(&b, "param inert%d = inert%d * 2\n", i, i-1)
		}
	}
	b.WriteString("param dc_mm = 100\nparam dc_bore = dc_mm * 1 mm\n")
	src := handSource(t)
	src = strings.Replace(src, "loss 40324.84", "loss orifice", 1)
	src = strings.Replace(src, "pipe downcomer from d to a { length 1 m; bore 100 mm", "pipe downcomer from d to a { length 1 m; bore dc_bore", 1)
	if !strings.Contains(src, "loss orifice") || !strings.Contains(src, "bore dc_bore") {
		t.Fatal("hand.loop no longer has the orifice and the downcomer bore this test varies")
	}
	src = b.String() + "param orifice = 40324.84\n" + strings.Replace(src, "case nominal", "limits { exit_quality 0.12 }\ncase nominal", 1)
	m := lang.LoadSource(fmt.Sprintf("../../testdata/flow/hand-many-%d.loop", n), []byte(src), lang.OSFS{})
	for _, d := range m.Diags {
		t.Fatalf("%s", d.Message())
	}
	return m
}

// Parameters that reach no field are found so from the references alone:
// in a file of 20,000 of them and three that reach the estimate (one
// through another), the three get the very guidance they get without the
// others (hand_test.go checks the orifice's against hand arithmetic), and
// every other one is inert, with no estimate spent on it.
func TestManyInertParams(t *testing.T) {
	small, err := Compute(context.Background(), manyParams(t, 0), Options{})
	if err != nil {
		t.Fatal(err)
	}
	const n = 20000
	m := manyParams(t, n)
	reach := m.ParamsReaching()
	if want := map[string]bool{"orifice": true, "dc_mm": true, "dc_bore": true}; !reflect.DeepEqual(reach, want) {
		t.Fatalf("reaching the estimate: %v, want %v", reach, want)
	}
	g, err := Compute(context.Background(), m, Options{})
	if err != nil {
		t.Fatal(err)
	}
	if g.Skipped != "" {
		t.Errorf("skipped: %s", g.Skipped)
	}
	if len(g.Params) != n+3 {
		t.Fatalf("%d params, want %d", len(g.Params), n+3)
	}
	for _, p := range g.Params[:n] {
		if p.Influences || p.Skipped || p.Range != nil || len(p.Sensitivities) != 0 {
			t.Fatalf("%s: %+v", p.Param, p)
		}
	}
	for _, name := range []string{"dc_mm", "dc_bore", "orifice"} {
		got, want := paramOf(t, g, name), paramOf(t, small, name)
		if !got.Influences || got.Range == nil || len(got.Sensitivities) == 0 {
			t.Errorf("%s: %+v", name, got)
		}
		if !reflect.DeepEqual(got, want) {
			t.Errorf("%s: %+v\nwithout the inert parameters %+v", name, got, want)
		}
	}
	if g.Estimates != small.Estimates {
		t.Errorf("%d estimates, %d without the inert parameters", g.Estimates, small.Estimates)
	}
}

// More parameters reaching the estimate than the guidance searches: none
// is searched, and the guidance says why.
func TestTooManyReachingParams(t *testing.T) {
	const n = MaxSearched + 50
	var b, sum strings.Builder
	for i := 0; i < n; i++ {
		fmt.Fprintf(&b, "param s%d = %d\n", i, i+1)
		if i > 0 {
			sum.WriteString(" + ")
		}
		fmt.Fprintf(&sum, "s%d", i)
	}
	src := strings.Replace(handSource(t), "pipe downcomer from d to a { length 1 m; bore 100 mm; roughness 0 m", "pipe downcomer from d to a { length 1 m; bore 100 mm; roughness ("+sum.String()+") * 0 m", 1)
	if !strings.Contains(src, sum.String()) {
		t.Fatal("hand.loop no longer has the downcomer roughness this test sets")
	}
	m := load(t, "../../testdata/flow/hand-reaching.loop", b.String()+src)
	for _, d := range m.Diags {
		t.Fatalf("%s", d.Message())
	}
	g, err := Compute(context.Background(), m, Options{})
	if err != nil {
		t.Fatal(err)
	}
	want := "guidance skipped: 250 parameters reach the estimate; the limit for a file of this size is 200"
	if !strings.HasPrefix(g.Skipped, want) {
		t.Errorf("skipped: %q, want it to start %q", g.Skipped, want)
	}
	if g.Estimates != 0 || len(g.Levers) != 0 {
		t.Errorf("%d estimates, %d levers", g.Estimates, len(g.Levers))
	}
	for _, p := range g.Params {
		if !p.Influences || !p.Skipped || p.Range != nil || len(p.Sensitivities) != 0 {
			t.Fatalf("%s: %+v", p.Param, p)
		}
	}
	if len(g.Loops) != 1 || g.Loops[0].Loop != "hand" {
		t.Errorf("loops: %+v", g.Loops)
	}
}

func TestSearchLimit(t *testing.T) {
	for _, c := range []struct{ params, want int }{
		{0, MaxSearched}, {1, MaxSearched}, {10000, MaxWork / 10000}, {20000, 100}, {500000, 4}, {10_000_000, 1},
	} {
		m := &lang.Model{Params: make([]*lang.Param, c.params)}
		if got := searchLimit(m); got != c.want {
			t.Errorf("%d params: limit %d, want %d", c.params, got, c.want)
		}
	}
	if got := thousands(1234567); got != "1,234,567" {
		t.Errorf("thousands: %s", got)
	}
}

// The searches' cost counts the steady states of each estimate, not the
// parameters alone: the two parameters that reach the estimate in a file
// of 150 cases (with the tilt search, about 424 steady states a case per
// parameter) would take more than MaxStates, so none is searched and the
// guidance says why; the same parameters in a file of 10 cases are
// searched.
func TestTooManyCasesSkipped(t *testing.T) {
	build := func(cases int) *lang.Model {
		src := "param orifice = 40324.84\nparam lift = 1 m\nparam q = 5 kW\n" + strings.Replace(handSource(t), "loss 40324.84", "loss orifice", 1)
		src = strings.Replace(src, "case nominal { heat heater 5 kW }", "", 1)
		for i := 0; i < cases; i++ {
			fmt.Fprintf(&src2{&src}, "case c%d { heat heater q * %g }\n", i, 0.5+float64(i)/float64(2*cases))
		}
		if !strings.Contains(src, "loss orifice") {
			t.Fatal("hand.loop no longer has the orifice this test varies")
		}
		m := lang.LoadSource(fmt.Sprintf("../../testdata/flow/hand-cases-%d.loop", cases), []byte(src), lang.OSFS{})
		for _, d := range m.Diags {
			t.Fatalf("%s", d.Message())
		}
		return m
	}
	g, err := Compute(context.Background(), build(150), Options{})
	if err != nil {
		t.Fatal(err)
	}
	t.Log(g.Skipped)
	want := "guidance skipped: searching the 2 parameters that reach the estimate would take about "
	if !strings.HasPrefix(g.Skipped, want) || !strings.Contains(g.Skipped, "150 cases") || !strings.Contains(g.Skipped, "the limit is 100,000") {
		t.Errorf("skipped: %q, want it to start %q and name the cases and the limit", g.Skipped, want)
	}
	if g.Estimates != 0 {
		t.Errorf("%d estimates", g.Estimates)
	}
	for _, p := range g.Params {
		if p.Influences != (p.Param != "lift") || p.Skipped != p.Influences || p.Range != nil {
			t.Errorf("%s: influences %v, skipped %v, range %v", p.Param, p.Influences, p.Skipped, p.Range)
		}
	}
	g, err = Compute(context.Background(), build(10), Options{Flow: flow.Options{NoTilt: true}})
	if err != nil {
		t.Fatal(err)
	}
	if g.Skipped != "" || g.Estimates == 0 {
		t.Errorf("10 cases: skipped %q after %d estimates", g.Skipped, g.Estimates)
	}
}

// src2 appends to a string.
type src2 struct{ s *string }

func (w *src2) Write(b []byte) (int, error) { *w.s += string(b); return len(b), nil }
