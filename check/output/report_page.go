package output

import "html/template"

// reportPage lays the report out. It has no scripts and loads nothing: the
// styles are inline and the figures are inline SVG, so the page reads the
// same offline, attached to a review or kept as a CI artifact.
var reportPage = template.Must(template.New("report").Parse(`<!DOCTYPE html>
<html lang="en">
<head>
<meta charset="utf-8">
<meta name="viewport" content="width=device-width, initial-scale=1">
<title>{{.Title}}</title>
<style>
body { font-family: "DejaVu Sans", "Liberation Sans", Arial, sans-serif; font-size: 14px; line-height: 1.4; color: #1b1b1b; margin: 0 auto; max-width: 1100px; padding: 16px 24px 48px; }
h1 { font-size: 24px; margin: 8px 0 4px; }
h2 { font-size: 19px; border-bottom: 2px solid #34495e; padding-bottom: 3px; margin-top: 32px; }
h3 { font-size: 16px; margin: 22px 0 8px; }
.meta { color: #555; font-size: 12px; }
.cautions { background: #fff6e0; border: 1px solid #e0b24c; border-left: 6px solid #d48a00; padding: 8px 16px; margin: 12px 0; }
.cautions h2 { border: none; margin: 4px 0; font-size: 17px; }
.cautions li { margin: 4px 0; }
table { border-collapse: collapse; margin: 6px 0 12px; font-size: 13px; }
th, td { border: 1px solid #c8ccd0; padding: 3px 8px; text-align: left; vertical-align: top; }
th { background: #eef1f4; }
td.num { text-align: right; font-variant-numeric: tabular-nums; white-space: nowrap; }
.ok { color: #176b2c; }
.warning { color: #8a5a00; background: #fff3d6; }
.error { color: #a11; background: #fde4e4; font-weight: bold; }
.info { color: #1f4f8a; }
.badge { display: inline-block; padding: 1px 8px; border-radius: 10px; margin-right: 8px; font-weight: bold; }
figure { margin: 12px 0; }
.wide { overflow-x: auto; }
figure svg { max-width: 100%; width: 760px; height: auto; border: 1px solid #e3e5e8; background: #fff; }
figcaption { color: #444; font-size: 12px; margin-top: 2px; }
.note { color: #444; font-size: 12px; }
code { font-family: "DejaVu Sans Mono", monospace; font-size: 12px; }
@media print { h2 { break-before: auto; } figure, table { break-inside: avoid; } }
</style>
</head>
<body>
<header>
<h1>{{.Title}}</h1>
<p class="meta">Made by circa{{if .Version}} {{.Version}}{{end}} from <code>{{.File}}</code>{{if .SHA256}} (SHA-256 <code>{{.SHA256}}</code>){{end}}. A quick steady-state estimate for design review, not a simulation; confirm by test.</p>
</header>

<section class="cautions" id="cautions">
<h2>Cautions</h2>
<ul>
{{range .Cautions}}<li>{{.}}</li>
{{end}}<li>Everything here defers to local codes and licensed engineering practice.</li>
</ul>
</section>

<section id="summary">
<h2>Summary</h2>
<p><span class="badge error">{{index .Badges 0}}</span><span class="badge warning">{{index .Badges 1}}</span><span class="badge info">{{index .Badges 2}}</span></p>
<p>{{.Summary}}</p>
{{range .Variant}}<p class="warning">{{.}}: this report is of a variant, not of the file as written.</p>
{{end}}{{if .NoEstimate}}<p class="error">{{.NoEstimate}}</p>{{end}}
</section>

{{range .Loops}}
<section class="loop" id="loop-{{.Name}}">
<h2>Loop {{.Name}}</h2>
<p>Fluid {{.Fluid}}{{if .Safety}} (safety class {{.Safety}}){{end}}, {{.Kind}}.{{if .Charge}} Charge: {{.Charge}}.{{end}}</p>
{{range .Findings}}<p class="{{.Severity}}">{{.Severity}}: {{.Message}}</p>
{{end}}
{{range .Errors}}<p class="error">Not drawn: {{.}}</p>
{{end}}
{{with .Geometry}}<h3>Geometry</h3>
<figure>{{.SVG}}<figcaption>{{.Caption}}</figcaption></figure>{{end}}

<h3>Operating points</h3>
<table>
<tr><th>case</th><th>attitude</th><th>heat</th><th>saturation</th><th>mass flow</th><th>highest exit quality</th><th>limiting margin</th><th>status</th></tr>
{{range .Cases}}<tr><td>{{.Name}}{{if .Flag}}<br><span class="warning">{{.Flag}}</span>{{end}}</td><td>{{.Attitude}}</td><td class="num">{{.Heat}}</td><td>{{.Saturation}}</td><td class="num">{{.Flow}}</td><td class="num">{{.ExitQuality}}</td><td>{{.Limiting}}</td><td class="{{.Status}}">{{.Status}}</td></tr>
{{if .Balances}}<tr><td></td><td colspan="7" class="note">{{.Balances}}</td></tr>{{end}}
{{end}}</table>

<h3>Margins</h3>
<p class="note">Use is the fraction of the limit used: 1 or more reaches the limit. The limiting case is the one that uses the most.</p>
<table>
<tr><th>margin</th><th>limiting case</th><th>component</th><th>value</th><th>limit</th><th>use</th><th>status</th></tr>
{{range .Margins}}<tr><td>{{.Name}}</td><td>{{.Case}}</td><td>{{.Component}}</td><td class="num">{{.Value}}</td><td class="num">{{.Limit}}</td><td class="num">{{.Use}}</td><td class="{{.Status}}">{{.Status}}</td></tr>
{{end}}</table>
<p class="note">Use of each limit in every case (the largest over the components):</p>
<div class="wide"><table>
<tr><th>case</th>{{range .Margins}}<th>{{.Name}}</th>{{end}}</tr>
{{range .UseRows}}<tr><td>{{.Case}}</td>{{range .Cells}}<td class="num {{.Status}}">{{.Text}}</td>{{end}}</tr>
{{end}}</table></div>

{{with .Sweep}}<h3>Parameter sweep</h3>
<p>{{.Heading}}: {{.Note}}</p>
{{with .Figure}}<figure>{{.SVG}}<figcaption>{{.Caption}}</figcaption></figure>{{end}}
{{if .Error}}<p class="error">Not drawn: {{.Error}}</p>{{end}}
<div class="wide"><table>
<tr>{{range .Head}}<th>{{.}}</th>{{end}}</tr>
{{range .Rows}}<tr>{{range .}}<td class="num {{.Status}}">{{.Text}}</td>{{end}}</tr>
{{end}}</table></div>
{{end}}
<h3>Circulation and pressure budget</h3>
{{range .Curves}}<figure>{{.SVG}}<figcaption>{{.Caption}}</figcaption></figure>
{{end}}
{{if .Budget}}<p class="note">Case {{.BudgetCase}}: {{.Convention}}.</p>
<table>
<tr><th>component</th><th>friction</th><th>gravity</th><th>acceleration</th><th>area change</th><th>local</th><th>total (Pa)</th></tr>
{{range .Budget}}<tr><td>{{.Component}}</td>{{range .Terms}}<td class="num">{{.}}</td>{{end}}</tr>
{{end}}</table>{{end}}

<h3>Tilt and acceleration envelope</h3>
{{range .Envelope}}<figure>{{.SVG}}<figcaption>{{.Caption}}</figcaption></figure>
{{end}}
<table>
<tr><th>case</th><th>where circulation stops</th><th>where the first margin fails</th><th>tilt margin</th></tr>
{{range .Tilt}}<tr><td>{{.Case}}</td><td>{{.Stops}}</td><td>{{.FirstFailure}}</td><td>{{.Margin}}</td></tr>
{{end}}</table>
{{if .Accel}}<p class="note">{{.AccelNote}}</p>
<table>
<tr><th>direction</th><th>acceleration (gn)</th><th>mass flow</th><th>limiting margin</th><th>use</th><th>status</th></tr>
{{range .Accel}}<tr><td>{{.Direction}}</td><td class="num">{{.Accel}}</td><td class="num">{{.Flow}}</td><td>{{.Limiting}}</td><td class="num">{{.Use}}</td><td class="{{.Status}}">{{.Status}}</td></tr>
{{end}}</table>{{end}}

<h3>Methods and assumptions</h3>
<p>Void fraction {{.Methods.Void}}; two-phase friction {{.Methods.Friction}}; single-phase friction {{.Methods.SinglePhase}}; critical heat flux {{.Methods.CHF}}; {{.Methods.Cells}} cells per heated component.</p>
<ul>{{range .Assumptions}}<li>{{.}}</li>{{end}}</ul>
</section>
{{end}}

<section id="findings">
<h2>Findings</h2>
{{if .Findings}}<table>
<tr><th>location</th><th>severity</th><th>rule</th><th>message</th></tr>
{{range .Findings}}<tr><td><code>{{.Where}}</code></td><td class="{{.Severity}}">{{.Severity}}</td><td><code>{{.Rule}}</code></td><td>{{.Message}}</td></tr>
{{end}}</table>{{else}}<p>No findings.</p>{{end}}
<p class="note">"circa explain RULE" tells what a rule checks and how to fix its findings.</p>
</section>
</body>
</html>
`))
