package guide

import (
	"fmt"
	"path/filepath"
	"slices"
	"sort"
	"sync"

	"circa/check/flow"
	"circa/check/fluid"
	"circa/lang"
	"circa/units"
)

// Fluid is how one working fluid would fare in a loop, everything else as
// written.
type Fluid struct {
	Fluid string `json:"fluid"`
	// Table is the path of a user table (a fluid the file names by table).
	Table  string `json:"table,omitempty"`
	Safety string `json:"safety_class,omitempty"` // ASHRAE 34 / ISO 817
	// Current marks the loop's own fluid.
	Current bool `json:"current,omitempty"`
	// Covers is false when the fluid's range does not reach the saturation
	// temperature of some case (Reason says which); such a fluid is not
	// ranked.
	Covers bool `json:"covers"`
	// Use and Limit are the loop's largest margin use with this fluid, the
	// charge margin left out (the charge would be set for the fluid: Charge
	// is the range it needs), and where it is; Stop says why it has no
	// usable estimate or no charge suits every case (StopNoCharge).
	Use    float64 `json:"use"`
	Limit  Where   `json:"limit"`
	Stop   string  `json:"stop,omitempty"`
	Reason string  `json:"reason,omitempty"`
	// SaturationPressure is the saturation pressure, Pa absolute, in the
	// hottest case (HottestCase); DesignPressure the loop's rating when it
	// states one, and PressureUse their ratio.
	SaturationPressure float64 `json:"saturation_pressure"`
	HottestCase        string  `json:"hottest_case,omitempty"`
	DesignPressure     float64 `json:"design_pressure,omitempty"`
	PressureUse        float64 `json:"pressure_use,omitempty"`
	// Charge is the fill charge every case accepts with this fluid (when
	// the loop states a charge).
	Charge *flow.ChargeRange `json:"charge,omitempty"`
}

// fluids ranks, in each loop, every built-in fluid and each table the file
// names, by the limiting margin each leaves.
func (gd *guider) fluids(g *Guidance) {
	specs := fluidSpecs(gd.m)
	var wg sync.WaitGroup
	for li, l := range gd.m.Loops {
		if l.Unresolved {
			continue
		}
		out := make([]Fluid, len(specs))
		for i, sp := range specs {
			wg.Add(1)
			go func() {
				defer wg.Done()
				out[i] = gd.tryFluid(li, l, sp)
			}()
		}
		wg.Wait()
		rankFluids(out)
		g.Loops[li].Fluids = out
	}
}

// fluidSpecs lists the built-in fluids, then the tables the file names.
func fluidSpecs(m *lang.Model) []lang.FluidSpec {
	var out []lang.FluidSpec
	for _, n := range fluid.Names() {
		out = append(out, lang.FluidSpec{Name: n, Set: true})
	}
	seen := map[string]bool{}
	for _, l := range m.Loops {
		if t := l.Fluid.Table; t != "" && !seen[t] {
			seen[t] = true
			out = append(out, lang.FluidSpec{Name: filepath.Base(t), Table: t, Set: true})
		}
	}
	return out
}

// tryFluid estimates loop l (index li of the model) with fluid sp.
func (gd *guider) tryFluid(li int, l *lang.Loop, sp lang.FluidSpec) Fluid {
	f := Fluid{Fluid: sp.Name, Table: sp.Table, Covers: true}
	if sp.Table == "" {
		f.Current = l.Fluid.Table == "" && fluid.Known(l.Fluid.Name) && canonical(l.Fluid.Name) == sp.Name
	} else {
		f.Current = l.Fluid.Table == sp.Table
	}
	if gd.ctx.Err() != nil {
		f.Stop = StopError
		return f
	}
	// A shallow copy with the loop's fluid replaced: the model is shared
	// and never changed.
	mv := *gd.m
	lv := *l
	lv.Fluid = sp
	mv.Loops = slices.Clone(gd.m.Loops)
	mv.Loops[li] = &lv
	gd.sem <- struct{}{}
	gd.estimates.Add(1)
	// Another fluid is a design of its own: no state pinned.
	lr := flow.EstimateLoop(&mv, &lv, gd.own)
	<-gd.sem
	if lr.Fluid != "" {
		f.Fluid = lr.Fluid
	}
	f.Safety = lr.Safety
	f.Charge = lr.ChargeRange
	if l.DesignPressure.Set && l.DesignPressure.SI > 0 {
		f.DesignPressure = l.DesignPressure.SI
	}
	for ci := range lr.Cases {
		c := &lr.Cases[ci]
		if c.Grid {
			continue
		}
		for _, fd := range c.Findings {
			if fd.Rule == flow.RuleFluidRange && f.Covers {
				f.Covers, f.Reason = false, fd.Message
			}
		}
		if c.SatPressure > f.SaturationPressure {
			f.SaturationPressure, f.HottestCase = c.SatPressure, c.Case
		}
	}
	if f.DesignPressure > 0 {
		f.PressureUse = f.SaturationPressure / f.DesignPressure
	}
	// The charge would be set for the fluid: its margin is left out of the
	// ranking, and the range it needs is reported instead.
	s, _ := summarize(&flow.Result{Loops: []flow.LoopResult{lr}}, 0, func(w Where) bool {
		return w.Margin != flow.MarginCharge && gd.plain(w)
	})
	f.Use, f.Limit = s.Use, s.Limit
	switch {
	case !f.Covers:
	case s.Stop != nil:
		f.Stop, f.Reason = s.Stop.Kind, s.Stop.Message
	case f.Charge != nil && f.Charge.Low > f.Charge.High:
		f.Stop = StopNoCharge
		f.Reason = fmt.Sprintf("no charge suits every case: case %s needs at least %s kg, case %s takes at most %s kg",
			f.Charge.LowCase, units.Sig(f.Charge.Low, 3), f.Charge.HighCase, units.Sig(f.Charge.High, 3))
	}
	return f
}

// canonical is a built-in fluid's canonical name.
func canonical(name string) string {
	fl, err := fluid.Lookup(name)
	if err != nil {
		return name
	}
	return fl.Info().Name
}

// rankFluids orders fluids: those with a usable estimate by their limiting
// margin's use, then those without one, then those whose range does not
// cover the cases.
func rankFluids(fs []Fluid) {
	rank := func(f Fluid) int {
		switch {
		case !f.Covers:
			return 2
		case f.Stop != "":
			return 1
		}
		return 0
	}
	sort.SliceStable(fs, func(i, j int) bool {
		a, b := rank(fs[i]), rank(fs[j])
		if a != b {
			return a < b
		}
		if a == 0 && fs[i].Use != fs[j].Use {
			return fs[i].Use < fs[j].Use
		}
		return fs[i].Fluid < fs[j].Fluid
	})
}
