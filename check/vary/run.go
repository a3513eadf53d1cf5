package vary

import (
	"context"
	"fmt"
	"runtime"
	"sort"
	"sync"

	"circa/check/flow"
	"circa/lang"
)

// Result is a sweep: the estimate's margins at every point of a grid of
// parameter values. Its layout is documented in docs/estimate-json.md.
type Result struct {
	Cautions []string `json:"cautions"`
	Params   []Param  `json:"params"`
	// Points are in row-major order: the last parameter varies fastest.
	Points []Point `json:"points"`
	// Tilt says whether the tilt limits were searched at each point; a
	// sweep leaves them out unless asked, the search repeating the estimate
	// many times.
	Tilt bool `json:"tilt"`
	// Set lists the parameters the swept model was given in place of its
	// files' values (circa estimate --set): they hold at every point.
	Set []flow.ParamSet `json:"set,omitempty"`
}

// Param is one axis of a sweep.
type Param struct {
	Param     string    `json:"param"`
	Dimension string    `json:"dimension"`
	Unit      string    `json:"unit"`   // the unit the values were written in ("" for SI)
	Values    []float64 `json:"values"` // SI
	Written   []string  `json:"written"`
	// FileValue is the file's own value, SI (absent when the file's
	// expression is in error); FileWritten is that expression as written.
	FileValue   *float64 `json:"file_value,omitempty"`
	FileWritten string   `json:"file_written"`
}

// Point is the estimate at one combination of values.
type Point struct {
	Index   []int     `json:"index"`  // position on each axis
	Values  []float64 `json:"values"` // SI, one per axis
	Written []string  `json:"written"`
	Loops   []Loop    `json:"loops"`
	// Error says why the point has no estimate.
	Error string `json:"error,omitempty"`
}

// Loop is one loop's margins at a point.
type Loop struct {
	Loop string `json:"loop"`
	// Margins holds, for each margin, the case closest to its limit.
	Margins []flow.Margin `json:"margins"`
	// Limiting is the margin of highest use, absent without margins.
	Limiting *flow.Margin `json:"limiting,omitempty"`
	// NoCirculation lists the cases in which the loop does not circulate:
	// their margins are missing.
	NoCirculation []string `json:"no_circulation,omitempty"`
	// Errors are the estimate's error findings at the point.
	Errors []string `json:"errors,omitempty"`
	// Local lists, under saturation_state auto, the cases estimated at
	// local saturation at this point (their liquid column raises the
	// saturation at an evaporator inlet by more than 5 K); the others took
	// the single state. A margin may step between two points where the
	// list changes.
	Local []string `json:"local_cases,omitempty"`
}

// Options tune a sweep.
type Options struct {
	// Flow are the estimate's options; NoTilt is forced unless Tilt is set.
	Flow flow.Options
	Tilt bool
	// Workers estimates points in parallel (0: one per processor).
	Workers int
	// Progress, when set, is told how many points are done.
	Progress func(done, total int)
}

// Run estimates m at every combination of the axes' values (one or two
// axes). An axis naming a parameter m does not declare, or values of the
// wrong dimension, give an error before anything is estimated. A cancelled
// ctx stops the sweep with ctx's error.
func Run(ctx context.Context, m *lang.Model, axes []Axis, o Options) (*Result, error) {
	if len(axes) == 0 || len(axes) > 2 {
		return nil, fmt.Errorf("a sweep varies one or two parameters, not %d", len(axes))
	}
	if len(axes) == 2 && axes[0].Param == axes[1].Param {
		return nil, fmt.Errorf("%s is varied twice", axes[0].Param)
	}
	res := &Result{Cautions: append([]string(nil), flow.Cautions...), Tilt: o.Tilt, Set: flow.ParamsSet(m)}
	first := make([]lang.Override, len(axes))
	for i, a := range axes {
		if len(a.Values) == 0 {
			return nil, fmt.Errorf("%s has no values", a.Param)
		}
		first[i] = a.Values[0]
	}
	// Every value is checked against the file's parameter before the
	// first estimate.
	probe, err := m.With(first...)
	if err != nil {
		return nil, err
	}
	for _, a := range axes {
		for _, v := range a.Values[1:] {
			if _, err := m.With(v); err != nil {
				return nil, err
			}
		}
	}
	set := flow.ParamsSet(probe)
	for _, a := range axes {
		p := Param{Param: a.Param, Unit: a.Unit}
		for _, v := range a.Values {
			p.Values = append(p.Values, v.Value.SI)
			p.Written = append(p.Written, v.Written())
		}
		for _, ps := range set {
			if ps.Param == a.Param {
				p.Dimension, p.FileValue, p.FileWritten = ps.Dimension, ps.FileValue, ps.FileWritten
			}
		}
		res.Params = append(res.Params, p)
	}
	// The grid, last axis fastest.
	var idx [][]int
	for i := range axes[0].Values {
		if len(axes) == 1 {
			idx = append(idx, []int{i})
			continue
		}
		for j := range axes[1].Values {
			idx = append(idx, []int{i, j})
		}
	}
	res.Points = make([]Point, len(idx))
	fo := o.Flow
	fo.NoTilt = fo.NoTilt || !o.Tilt
	workers := o.Workers
	if workers <= 0 {
		workers = runtime.GOMAXPROCS(0)
	}
	jobs := make(chan int)
	var wg sync.WaitGroup
	var mu sync.Mutex
	done := 0
	for range min(workers, len(idx)) {
		wg.Add(1)
		go func() {
			defer wg.Done()
			for k := range jobs {
				res.Points[k] = point(m, axes, idx[k], fo)
				if o.Progress != nil {
					mu.Lock()
					done++
					o.Progress(done, len(idx))
					mu.Unlock()
				}
			}
		}()
	}
feed:
	for k := range idx {
		if ctx.Err() != nil {
			break
		}
		select {
		case jobs <- k:
		case <-ctx.Done():
			break feed
		}
	}
	close(jobs)
	wg.Wait()
	if err := ctx.Err(); err != nil {
		return nil, err
	}
	return res, nil
}

// point estimates m with the axes at the values idx picks.
func point(m *lang.Model, axes []Axis, idx []int, fo flow.Options) Point {
	p := Point{Index: idx}
	ovs := make([]lang.Override, len(axes))
	for i, a := range axes {
		ovs[i] = a.Values[idx[i]]
		p.Values = append(p.Values, ovs[i].Value.SI)
		p.Written = append(p.Written, ovs[i].Written())
	}
	v, err := m.With(ovs...)
	if err != nil {
		p.Error = err.Error()
		return p
	}
	for _, d := range v.Diags {
		if d.Severity == lang.Error {
			p.Error = "the variant has errors: " + d.Message()
			return p
		}
	}
	est, err := flow.Estimate(v, fo)
	if err != nil {
		p.Error = err.Error()
		return p
	}
	for _, lr := range est.Loops {
		p.Loops = append(p.Loops, loopPoint(lr))
	}
	return p
}

func loopPoint(lr flow.LoopResult) Loop {
	l := Loop{Loop: lr.Loop, Margins: append([]flow.Margin{}, lr.Worst...)}
	sort.SliceStable(l.Margins, func(i, j int) bool { return l.Margins[i].Margin < l.Margins[j].Margin })
	for i := range l.Margins {
		if l.Limiting == nil || l.Margins[i].Use > l.Limiting.Use {
			l.Limiting = &l.Margins[i]
		}
	}
	for _, c := range lr.Cases {
		if !c.Circulates {
			l.NoCirculation = append(l.NoCirculation, c.Case)
		}
		if lr.Methods.Saturation == "auto" && !c.Grid && c.SatState == "local" {
			l.Local = append(l.Local, c.Case)
		}
	}
	for _, f := range lr.Findings {
		if f.Severity == "error" {
			l.Errors = append(l.Errors, f.Message)
		}
	}
	for _, c := range lr.Cases {
		for _, f := range c.Findings {
			if f.Severity == "error" {
				l.Errors = append(l.Errors, f.Message)
			}
		}
	}
	return l
}

// MarginNames lists the margins a loop has at any point of r, sorted.
func (r *Result) MarginNames(loop string) []string {
	seen := map[string]bool{}
	var out []string
	for _, p := range r.Points {
		for _, l := range p.Loops {
			if l.Loop != loop {
				continue
			}
			for _, mg := range l.Margins {
				if !seen[mg.Margin] {
					seen[mg.Margin] = true
					out = append(out, mg.Margin)
				}
			}
		}
	}
	sort.Strings(out)
	return out
}

// LoopNames lists the loops of r in the order of its points.
func (r *Result) LoopNames() []string {
	var out []string
	seen := map[string]bool{}
	for _, p := range r.Points {
		for _, l := range p.Loops {
			if !seen[l.Loop] {
				seen[l.Loop] = true
				out = append(out, l.Loop)
			}
		}
	}
	return out
}
