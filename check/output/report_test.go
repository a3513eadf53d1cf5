package output

import (
	"bytes"
	"context"
	"html"
	"image/png"
	"math"
	"os"
	"os/exec"
	"path/filepath"
	"regexp"
	"strings"
	"testing"
	"time"

	"circa/check/flow"
	"circa/lang"
)

func reportOf(t *testing.T, path string) (string, *lang.Model) {
	t.Helper()
	m := lang.Load(path, lang.OSFS{})
	var b bytes.Buffer
	var stages []string
	if err := Report(&b, path, m, ReportOptions{Version: "test", TiltStep: 10 * math.Pi / 180, Progress: func(s string) { stages = append(stages, s) }}); err != nil {
		t.Fatal(err)
	}
	if len(stages) < 3 {
		t.Errorf("progress told only %v", stages)
	}
	return b.String(), m
}

// The page is self-contained: no scripts, nothing fetched (no src, no
// links, no CSS url() or @import); the SVG namespaces are names, not
// fetches.
func TestReportSelfContained(t *testing.T) {
	page, _ := reportOf(t, "../../testdata/examples/rack-door.loop")
	for _, bad := range []*regexp.Regexp{
		regexp.MustCompile(`(?i)<script`), regexp.MustCompile(`(?i)\ssrc\s*=`), regexp.MustCompile(`(?i)<link`),
		regexp.MustCompile(`(?i)url\(`), regexp.MustCompile(`(?i)@import`), regexp.MustCompile(`(?i)<iframe|<object|<embed`),
		regexp.MustCompile(`(?i)href\s*=\s*"(?:https?:)?//`),
	} {
		if loc := bad.FindStringIndex(page); loc != nil {
			t.Errorf("page is not self-contained: %q", page[loc[0]:min(loc[1]+40, len(page))])
		}
	}
	if n := strings.Count(page, "<svg "); n != 4 {
		t.Errorf("%d inline figures, want 4 (geometry, circulation, budget, tilt)", n)
	}
	if strings.Contains(page, "<?xml") {
		t.Error("an XML declaration inside the page")
	}
}

// A file with errors still gets a report: its findings, located, and no
// estimate.
func TestReportOfBrokenFile(t *testing.T) {
	m := lang.LoadSource("broken.loop", []byte("loop l {\n  fluid water\n  pipe p from a to { length 1 m }\n}\n"), nil)
	var b bytes.Buffer
	if err := Report(&b, "broken.loop", m, ReportOptions{}); err != nil {
		t.Fatal(err)
	}
	page := b.String()
	if !strings.Contains(page, "no estimate was made") || !regexp.MustCompile(`<code>broken\.loop:3:\d+</code>`).MatchString(page) {
		t.Errorf("broken file's report:\n%s", page)
	}
}

// The ASHRAE 34 safety groups: A lower and B higher toxicity; 1 no flame
// propagation, 2L lower flammability, 2 flammable, 3 higher flammability
// (ANSI/ASHRAE Standard 34, section 6, from memory).
func TestSafetyClassMeaning(t *testing.T) {
	for class, want := range map[string]string{
		"A1":  "A1: lower toxicity, no flame propagation",
		"A2L": "A2L: lower toxicity, lower flammability",
		"B2L": "B2L: higher toxicity, lower flammability",
		"A3":  "A3: lower toxicity, higher flammability",
		"flammable (not classified in ASHRAE 34)": "flammable (not classified in ASHRAE 34)",
	} {
		if got := SafetyClassMeaning(class); !strings.HasPrefix(got, want) {
			t.Errorf("%s: %q, want %q", class, got, want)
		}
	}
}

// chromium finds Debian's chromium. Without it the browser tests skip,
// except in CI (CI=true), where they fail.
func chromium(t *testing.T) string {
	t.Helper()
	for _, name := range []string{"chromium", "chromium-browser"} {
		if p, err := exec.LookPath(name); err == nil {
			return p
		}
	}
	if os.Getenv("CI") == "true" {
		t.Fatal("chromium is not installed (apt-get install chromium); CI needs it for the report test")
	}
	t.Skip("chromium not installed")
	return ""
}

// runChromium loads a page in headless chromium with a fresh profile and
// returns its standard output and error.
func runChromium(t *testing.T, bin, page string, extra ...string) (string, string) {
	t.Helper()
	ctx, cancel := context.WithTimeout(context.Background(), 2*time.Minute)
	defer cancel()
	args := append([]string{"--headless", "--no-sandbox", "--disable-gpu", "--disable-background-networking",
		"--disable-component-update", "--disable-sync", "--no-first-run", "--user-data-dir=" + t.TempDir(),
		"--enable-logging=stderr", "--v=0"}, extra...)
	cmd := exec.CommandContext(ctx, bin, append(args, "file://"+page)...)
	var out, errb bytes.Buffer
	cmd.Stdout, cmd.Stderr = &out, &errb
	if err := cmd.Run(); err != nil {
		t.Fatalf("chromium: %v\n%s", err, errb.String())
	}
	return out.String(), errb.String()
}

// consoleLine matches the lines chromium logs for console messages and
// page errors with --enable-logging=stderr.
var consoleLine = regexp.MustCompile(`(?m)^.*(:CONSOLE[:(]\d+\)?\]|Uncaught|Failed to load resource|Not allowed to load).*$`)

// The detector of console errors does detect them: a page that logs one
// and fetches a missing file is caught.
func TestChromiumConsoleDetector(t *testing.T) {
	bin := chromium(t)
	dir := t.TempDir()
	page := filepath.Join(dir, "bad.html")
	os.WriteFile(page, []byte(`<!DOCTYPE html><html><body><img src="missing.png"><script>console.error("boom")</script></body></html>`), 0o644)
	_, errs := runChromium(t, bin, page, "--dump-dom")
	if l := consoleLine.FindString(errs); !strings.Contains(l, "boom") {
		t.Errorf("a console error went unseen:\n%s", errs)
	}
}

// The report renders in a real browser (Debian's chromium, headless): no
// console errors, a screenshot that shows a page, and text that names
// every margin of every loop with its limiting case and value.
func TestReportInChromium(t *testing.T) {
	bin := chromium(t)
	for _, name := range []string{"rack-door", "forestry-inverter"} {
		t.Run(name, func(t *testing.T) {
			path := "../../testdata/examples/" + name + ".loop"
			page, m := reportOf(t, path)
			dir := t.TempDir()
			file := filepath.Join(dir, name+".html")
			if err := os.WriteFile(file, []byte(page), 0o644); err != nil {
				t.Fatal(err)
			}
			shot := filepath.Join(dir, name+".png")
			dom, errs := runChromium(t, bin, file, "--window-size=1200,2400", "--hide-scrollbars", "--screenshot="+shot, "--dump-dom")
			if ls := consoleLine.FindAllString(errs, -1); len(ls) > 0 {
				t.Errorf("console messages loading the report:\n%s", strings.Join(ls, "\n"))
			}
			checkScreenshot(t, shot, 1200, 2400)
			if keep := os.Getenv("CIRCA_REPORT_DIR"); keep != "" {
				os.MkdirAll(keep, 0o755)
				os.WriteFile(filepath.Join(keep, name+".html"), []byte(page), 0o644)
				if b, err := os.ReadFile(shot); err == nil {
					os.WriteFile(filepath.Join(keep, name+".png"), b, 0o644)
				}
			}
			text := pageText(dom)
			res, err := flow.Estimate(m, flow.Options{})
			if err != nil {
				t.Fatal(err)
			}
			for _, want := range []string{"Cautions", "local codes and licensed engineering practice", "Operating points", "Margins",
				"Tilt and acceleration envelope", "Methods and assumptions", "Findings", "ASHRAE 34"} {
				if !strings.Contains(text, want) {
					t.Errorf("page text lacks %q", want)
				}
			}
			for _, l := range res.Loops {
				if len(l.Worst) == 0 {
					t.Fatalf("loop %s has no margins", l.Loop)
				}
				for _, c := range l.Cases {
					if !strings.Contains(text, c.Case) {
						t.Errorf("page text lacks case %s", c.Case)
					}
				}
				for _, w := range l.Worst {
					v, lim := MarginValue(&l, CaseOf(&l, w), w)
					row := regexp.MustCompile(regexp.QuoteMeta(w.Margin) + `\s+` + regexp.QuoteMeta(w.Case) + `\s+(` + regexp.QuoteMeta(w.Component) + `\s+)?` +
						regexp.QuoteMeta(v) + `\s+` + regexp.QuoteMeta(lim) + `\s+` + regexp.QuoteMeta(fixed(w.Use, 2)))
					if !row.MatchString(text) {
						t.Errorf("page text lacks margin %s: %s of %s in case %s", w.Margin, v, lim, w.Case)
					}
				}
			}
		})
	}
}

var tag = regexp.MustCompile(`(?s)<style.*?</style>|<svg.*?</svg>|<[^>]*>`)

// pageText is the text of an HTML document, figures left out, with
// whitespace collapsed.
func pageText(dom string) string {
	s := html.UnescapeString(tag.ReplaceAllString(dom, " "))
	return strings.Join(strings.Fields(s), " ")
}

// checkScreenshot decodes a screenshot and checks that it is the size
// asked for and shows a page: mostly light background with dark text and
// coloured figures, not one blank colour.
func checkScreenshot(t *testing.T, path string, w, h int) {
	t.Helper()
	f, err := os.Open(path)
	if err != nil {
		t.Fatal(err)
	}
	defer f.Close()
	img, err := png.Decode(f)
	if err != nil {
		t.Fatal(err)
	}
	if b := img.Bounds(); b.Dx() != w || b.Dy() != h {
		t.Errorf("screenshot %dx%d, want %dx%d", b.Dx(), b.Dy(), w, h)
	}
	dark, light, colours := 0, 0, map[[3]uint32]bool{}
	b := img.Bounds()
	for y := b.Min.Y; y < b.Max.Y; y += 3 {
		for x := b.Min.X; x < b.Max.X; x += 3 {
			r, g, bl, _ := img.At(x, y).RGBA()
			l := (r + g + bl) / 3 >> 8
			switch {
			case l < 80:
				dark++
			case l > 200:
				light++
			}
			colours[[3]uint32{r >> 12, g >> 12, bl >> 12}] = true
		}
	}
	total := (b.Dx() / 3) * (b.Dy() / 3)
	if dark < total/200 || light < total/2 || len(colours) < 20 {
		t.Errorf("screenshot does not look like the report: %d dark, %d light of %d samples, %d colours", dark, light, total, len(colours))
	}
}
