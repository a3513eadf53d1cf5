package output

import (
	"fmt"
	"strings"

	"circa/check/picture"
	"circa/check/vary"
)

// sweepData is a loop's parameter sweep in a report: the figure of margin
// use against the parameter and the table of each point.
type sweepData struct {
	Heading string
	Figure  *figureData
	Head    []string
	Rows    [][]cell
	Error   string
	Note    string
}

// sweepReport lays out loop's part of the sweep r.
func sweepReport(r *vary.Result, loop string) *sweepData {
	if r == nil {
		return nil
	}
	d := &sweepData{Heading: VaryHeading(r), Note: sweepNote(r)}
	if f, err := picture.VaryFigure(r, loop); err != nil {
		d.Error = err.Error()
	} else if svg, err := inlineSVG(f); err != nil {
		d.Error = err.Error()
	} else {
		d.Figure = &figureData{Caption: "Use of each margin's limit in its worst case against " + vary.DescribeParams(r), SVG: svg}
	}
	names := r.MarginNames(loop)
	for _, p := range r.Params {
		d.Head = append(d.Head, p.Param)
	}
	d.Head = append(append(d.Head, names...), "limiting")
	for _, pt := range r.Points {
		var row []cell
		for _, w := range pt.Written {
			row = append(row, cell{Text: w})
		}
		l := pointLoop(pt, loop)
		for _, n := range names {
			c := cell{Text: "–"}
			if l != nil {
				for _, mg := range l.Margins {
					if mg.Margin == n {
						c = cell{Text: fixed(100*mg.Use, 0) + " %", Status: mg.Status}
					}
				}
			}
			row = append(row, c)
		}
		row = append(row, cell{Text: limitingText(pt, l)})
		d.Rows = append(d.Rows, row)
	}
	return d
}

// sweepNote says what a report's sweep leaves out.
func sweepNote(r *vary.Result) string {
	var notes []string
	if !r.Tilt {
		notes = append(notes, "the tilt limits are not searched at sweep points")
	}
	notes = append(notes, "every other parameter keeps the file's value")
	return fmt.Sprintf("%s.", strings.Join(notes, "; "))
}
