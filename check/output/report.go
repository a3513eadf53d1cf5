package output

import (
	"bytes"
	"crypto/sha256"
	"encoding/hex"
	"fmt"
	"html/template"
	"io"
	"math"
	"regexp"
	"strings"

	"circa/check"
	"circa/check/flow"
	"circa/check/geom"
	"circa/check/picture"
	"circa/check/vary"
	"circa/lang"
)

// ReportOptions adjust a design review report.
type ReportOptions struct {
	// Version is the checker's version, printed in the report's header.
	Version string
	// Progress, when set, is told what the report is computing.
	Progress func(stage string)
	// TiltStep is the angle step of the tilt envelope, rad (0: 5°).
	TiltStep float64
	// Vary, when set, is a parameter sweep of the model, shown per loop.
	Vary *vary.Result
}

// Report writes a design review report of one loop file as a single
// self-contained HTML page: no scripts, no network, figures inline as SVG.
// It holds the cautions, the findings with their locations, and per loop
// the geometry, every case's operating point, the margins with the
// limiting case of each, the charge, the circulation curve and pressure
// budget, the tilt and acceleration envelope, and the methods and
// assumptions. A file with errors gets its findings and no estimate.
func Report(w io.Writer, path string, m *lang.Model, o ReportOptions) error {
	progress := o.Progress
	if progress == nil {
		progress = func(string) {}
	}
	r := &reportData{Title: "Design review: " + path, File: path, Version: o.Version}
	for _, p := range flow.ParamsSet(m) {
		r.Variant = append(r.Variant, ParamSetText(p))
	}
	if f := m.Files[m.Root]; f != nil {
		sum := sha256.Sum256(f.Src)
		r.SHA256 = hex.EncodeToString(sum[:])
	}
	hasErrors := false
	for _, d := range m.Diags {
		hasErrors = hasErrors || d.Severity == lang.Error
	}
	var res *flow.Result
	if !hasErrors && len(m.Loops) > 0 {
		progress("estimating every case")
		var err error
		if res, err = flow.Estimate(m, flow.Options{}); err != nil {
			return err
		}
	}
	progress("checking")
	rep := check.RunReport(m, check.Options{Estimate: res, SkipEstimates: res == nil})
	files := []File{{Path: path, Model: m, Report: rep}}
	for _, f := range Collect(files) {
		d := f.Diagnostic
		r.Findings = append(r.Findings, reportFinding{Where: Where(f.Model, d.Loc), Severity: d.Severity.String(), Rule: d.Rule, Message: d.Message()})
		r.Counts[severityIndex(d.Severity)]++
	}
	r.Summary = Summary(files, countsOf(files))
	for i, w := range []string{"error", "warning", "note"} {
		r.Badges[i] = plural(r.Counts[i], w)
	}
	if res != nil {
		r.Cautions = res.Cautions
		for i := range res.Loops {
			lr := &res.Loops[i]
			l := loopNamed(m, lr.Loop)
			if l == nil {
				continue
			}
			ld := loopReport(m, l, lr, o, progress)
			ld.Sweep = sweepReport(o.Vary, l.Name)
			r.Loops = append(r.Loops, ld)
		}
	} else {
		r.Cautions = flow.Cautions
		r.NoEstimate = "The file has errors (see the findings): no estimate was made."
		if len(m.Loops) == 0 {
			r.NoEstimate = "The file has no loop: no estimate was made."
		}
	}
	r.Cautions = append(append([]string(nil), r.Cautions...), specificCautions(m, res)...)
	progress("writing the page")
	return reportPage.Execute(w, r)
}

func severityIndex(s lang.Severity) int {
	switch s {
	case lang.Error:
		return 0
	case lang.Warning:
		return 1
	}
	return 2
}

func countsOf(files []File) map[lang.Severity]int {
	c := map[lang.Severity]int{}
	for _, f := range Collect(files) {
		c[f.Diagnostic.Severity]++
	}
	return c
}

type reportData struct {
	Title, File, Version, SHA256 string
	Summary                      string
	Counts                       [3]int    // errors, warnings, notes
	Badges                       [3]string // the counts in words
	Cautions                     []string
	Findings                     []reportFinding
	Loops                        []*loopData
	NoEstimate                   string
	Variant                      []string // the parameters set for the run
}

type reportFinding struct {
	Where, Severity, Rule, Message string
}

type loopData struct {
	Name, Fluid, Safety, Kind string
	Methods                   flow.MethodsUsed
	Assumptions               []string
	Findings                  []flow.Finding
	Charge                    string
	Cases                     []caseRow
	MarginNames               []string
	Margins                   []marginRow
	Budget                    []BudgetRow
	BudgetCase                string
	Convention                string
	Geometry                  *figureData
	Curves, Envelope          []figureData
	CaseNames                 []string
	UseRows                   []useRow
	Tilt                      []tiltRow
	Accel                     []accelRow
	AccelNote                 string
	Errors                    []string
	Sweep                     *sweepData // the parameter sweep, when asked for
}

type figureData struct {
	Caption string
	SVG     template.HTML
}

type caseRow struct {
	Name, Attitude, Heat, Saturation, Flow, ExitQuality, Limiting, Status string
	Flag                                                                  string
	Balances                                                              string
}

type marginRow struct {
	Name, Case, Component, Value, Limit, Use, Status string
	PerCase                                          []cell
}

type useRow struct {
	Case  string
	Cells []cell
}

type cell struct {
	Text, Status string
}

type tiltRow struct {
	Case, Stops, FirstFailure, Margin string
}

type accelRow struct {
	Direction, Accel, Flow, Limiting, Use, Status string
}

func loopReport(m *lang.Model, l *lang.Loop, lr *flow.LoopResult, o ReportOptions, progress func(string)) *loopData {
	d := &loopData{Name: lr.Loop, Fluid: lr.Fluid, Safety: lr.Safety, Methods: lr.Methods, Assumptions: lr.Assumptions,
		Findings: lr.Findings, Kind: "single loop", Convention: BudgetConvention}
	if lr.Network {
		d.Kind = "network of parallel branches"
	}
	if lr.ChargeRange != nil {
		d.Charge = ChargeSummary(lr.ChargeRange)
	}
	// Operating points.
	for i := range lr.Cases {
		c := &lr.Cases[i]
		row := caseRow{Name: c.Case, Attitude: fmt.Sprintf("pitch %s, roll %s", angle(c.Pitch), angle(c.Roll)), Heat: fixed(c.Heat, 0) + " W"}
		if a := c.Accel; a != [3]float64{} {
			row.Attitude += fmt.Sprintf("; acceleration (%s, %s, %s) gn", sig(a[0]/geom.Gn, 3), sig(a[1]/geom.Gn, 3), sig(a[2]/geom.Gn, 3))
		}
		if c.SatSource != "" {
			row.Saturation = temperature(c.SatTemperature) + ", " + pressureAs(c.SatPressure, lr.DesignPressureUnit)
		}
		row.Flow = "no circulation: " + c.Reason
		if c.Circulates {
			row.Flow = fixed(c.MassFlow*1e3, 2) + " g/s"
			x := math.Inf(-1)
			for _, s := range c.Components {
				if s.Kind == lang.Evaporator.String() {
					x = math.Max(x, s.XOut)
				}
			}
			if !math.IsInf(x, 0) {
				row.ExitQuality = fixed(x, 3)
			}
		}
		row.Status = "ok"
		if mg, ok := Limiting(c); ok {
			row.Limiting = fmt.Sprintf("%s %s (use %s)", mg.Margin, mg.Component, fixed(mg.Use, 2))
			row.Status = mg.Status
		}
		if !c.Circulates {
			row.Status = "error"
		}
		if len(StableRoots(c)) > 1 {
			row.Flag = "several operating points"
			row.Balances = OperatingPoints(c)
		}
		d.Cases = append(d.Cases, row)
	}
	// Margins: the limiting case of each, and its use in every case.
	for _, c := range lr.Cases {
		d.CaseNames = append(d.CaseNames, c.Case)
	}
	for _, w := range lr.Worst {
		v, lim := MarginValue(lr, CaseOf(lr, w), w)
		row := marginRow{Name: w.Margin, Case: w.Case, Component: w.Component, Value: v, Limit: lim, Use: fixed(w.Use, 2), Status: w.Status}
		for i := range lr.Cases {
			c := &lr.Cases[i]
			best, ok := flow.Margin{}, false
			for _, mg := range c.Margins {
				if mg.Margin == w.Margin && (!ok || mg.Use > best.Use) {
					best, ok = mg, true
				}
			}
			if ok {
				row.PerCase = append(row.PerCase, cell{fixed(best.Use, 2), best.Status})
			} else {
				row.PerCase = append(row.PerCase, cell{"–", ""})
			}
		}
		d.Margins = append(d.Margins, row)
	}
	for i, name := range d.CaseNames {
		row := useRow{Case: name}
		for _, mr := range d.Margins {
			row.Cells = append(row.Cells, mr.PerCase[i])
		}
		d.UseRows = append(d.UseRows, row)
	}
	// The nominal case's budget.
	nominal := ""
	if m.Nominal != nil {
		nominal = m.Nominal.Name
	}
	for i := range lr.Cases {
		c := &lr.Cases[i]
		if c.Case == nominal && c.Circulates && len(c.Components) > 0 {
			d.Budget, d.BudgetCase = BudgetRows(lr.Network, c), c.Case
			break
		}
	}
	// Figures.
	var into *[]figureData
	figure := func(stage, caption string, make func() (*picture.Figure, error)) {
		progress(fmt.Sprintf("loop %s: %s", lr.Loop, stage))
		f, err := make()
		if err == nil {
			var svg template.HTML
			if svg, err = inlineSVG(f); err == nil {
				fd := figureData{caption, svg}
				if into == nil {
					d.Geometry = &fd
				} else {
					*into = append(*into, fd)
				}
				return
			}
		}
		d.Errors = append(d.Errors, fmt.Sprintf("%s: %v", caption, err))
	}
	figure("geometry", "Geometry: side and front views", func() (*picture.Figure, error) {
		g, err := picture.GeometryOf(l)
		if err != nil {
			return nil, err
		}
		return g.Figure()
	})
	var tilt *picture.Tilt
	tiltStep := o.TiltStep
	if !(tiltStep > 0) {
		tiltStep = TiltEnvelopeStep
	}
	if len(m.Cases) > 0 {
		into = &d.Curves
		figure("circulation curve", "Circulation curve: mass flow and exit quality against heat load, with every case", func() (*picture.Figure, error) {
			c, err := picture.CirculationOf(m, l, picture.Options{})
			if err != nil {
				return nil, err
			}
			return c.Figure()
		})
		figure("pressure budget", "Pressure budget of the nominal case", func() (*picture.Figure, error) {
			b, err := picture.BudgetOf(m, l, "")
			if err != nil {
				return nil, err
			}
			return b.Figure()
		})
		into = &d.Envelope
		figure("tilt envelope", "Tilt envelope around the nominal case", func() (*picture.Figure, error) {
			t, err := picture.TiltOf(m, l, "", tiltStep)
			if err != nil {
				return nil, err
			}
			tilt = t
			return t.Figure()
		})
	}
	// Tilt limits of every case; where the first margin fails, around the
	// nominal case.
	for i := range lr.Cases {
		c := &lr.Cases[i]
		if c.Tilt == nil {
			continue
		}
		row := tiltRow{Case: c.Case, Stops: TiltSummary(c.Tilt)}
		if tilt != nil && c.Case == tilt.Case {
			row.FirstFailure = FailureText(tilt.FirstFailures(), tiltStep)
		}
		for _, mg := range c.Margins {
			if mg.Margin == flow.MarginTilt {
				row.Margin = fmt.Sprintf("%s° against %s° (%s)", fixed(deg(mg.Value), 1), fixed(deg(mg.Limit), 1), mg.Status)
			}
		}
		d.Tilt = append(d.Tilt, row)
	}
	if len(m.Cases) > 0 {
		progress(fmt.Sprintf("loop %s: acceleration envelope", lr.Loop))
		d.Accel, d.AccelNote = accelEnvelope(m, l, nominal)
	}
	return d
}

// AccelSteps are the steady accelerations, in standard gravities, of the
// report's acceleration envelope, along each horizontal axis of the
// equipment.
var AccelSteps = []float64{-1, -0.5, -0.25, 0.25, 0.5, 1}

// accelEnvelope estimates the nominal case under steady fore-aft and
// lateral accelerations.
func accelEnvelope(m *lang.Model, l *lang.Loop, nominal string) ([]accelRow, string) {
	var accels [][3]float64
	var dirs []string
	for _, ax := range []struct {
		name string
		i    int
	}{{"forward (+x)", 0}, {"left (+y)", 1}} {
		for _, g := range AccelSteps {
			var a [3]float64
			a[ax.i] = g * geom.Gn
			accels = append(accels, a)
			dirs = append(dirs, ax.name)
		}
	}
	lr := flow.EstimateLoop(m, l, flow.Options{Case: nominal, NoTilt: true, Sweep: &flow.Sweep{Accel: accels}})
	if len(lr.Cases) != len(accels)+1 {
		return nil, "the acceleration envelope could not be estimated"
	}
	var rows []accelRow
	for i := range accels {
		c := &lr.Cases[i+1]
		a := c.Accel
		row := accelRow{Direction: dirs[i], Accel: fmt.Sprintf("(%s, %s, %s)", sig(a[0]/geom.Gn, 3), sig(a[1]/geom.Gn, 3), sig(a[2]/geom.Gn, 3)), Flow: "none", Status: "error"}
		if c.Circulates {
			row.Flow = fixed(c.MassFlow*1e3, 2) + " g/s"
			row.Status = "ok"
		}
		if mg, ok := Limiting(c); ok {
			row.Limiting = strings.TrimSpace(mg.Margin + " " + mg.Component)
			row.Use = fixed(mg.Use, 2)
			if c.Circulates {
				row.Status = mg.Status
			}
		}
		rows = append(rows, row)
	}
	return rows, fmt.Sprintf("Case %s under steady accelerations of the equipment frame, in standard gravities (9.80665 m/s²), the attitude kept; the body force is g − a. The loss reserve is not evaluated here.", lr.Cases[0].Case)
}

var xmlHead = regexp.MustCompile(`^\s*<\?xml[^>]*\?>\s*(<!--.*?-->\s*)?`)

// inlineSVG renders a figure as SVG fit for an HTML page: no XML
// declaration, scaled to the page's width.
func inlineSVG(f *picture.Figure) (template.HTML, error) {
	var b bytes.Buffer
	if err := f.Render(&b, "svg"); err != nil {
		return "", err
	}
	s := xmlHead.ReplaceAllString(b.String(), "")
	if !strings.HasPrefix(s, "<svg") {
		return "", fmt.Errorf("unexpected SVG output")
	}
	s = strings.Replace(s, "<svg ", `<svg role="img" `, 1)
	return template.HTML(s), nil
}

func loopNamed(m *lang.Model, name string) *lang.Loop {
	for _, l := range m.Loops {
		if l.Name == name {
			return l
		}
	}
	return nil
}
