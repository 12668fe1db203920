package htmlreport

import (
	"bytes"
	"image"
	"image/color"
	"image/gif"
	"image/png"
	"os"
	"path/filepath"
	"regexp"
	"strings"
	"testing"

	"rollerbed/io/runfolder"
)

// writePNG writes a small PNG image.
func writePNG(t *testing.T, path string) {
	t.Helper()
	img := image.NewRGBA(image.Rect(0, 0, 4, 3))
	img.Set(1, 1, color.RGBA{200, 10, 10, 255})
	var b bytes.Buffer
	png.Encode(&b, img)
	if err := os.WriteFile(path, b.Bytes(), 0o644); err != nil {
		t.Fatal(err)
	}
}

// runFolder writes a run folder with a summary, a case and figures.
func runFolder(t *testing.T) string {
	t.Helper()
	dir := t.TempDir()
	os.WriteFile(filepath.Join(dir, runfolder.CaseFile), []byte("title = \"<b>bold</b> & co\"\n"), 0o644)
	pen := 0.0125
	sum := runfolder.Summary{
		Run:     runfolder.RunSummary{Title: "A <title>", Steps: 42, SimTime: 12.5, Warnings: []string{"the flow was still spinning up"}},
		Flow:    runfolder.FlowSummary{BulkVelocity: 0.125, PenetrationDepth: &pen},
		Scalars: map[string]runfolder.ScalarSummary{"oxygen": {TotalUptake: 2e-6}},
	}
	if err := sum.Write(dir); err != nil {
		t.Fatal(err)
	}
	figs := filepath.Join(dir, runfolder.FiguresDir)
	os.MkdirAll(figs, 0o755)
	writePNG(t, filepath.Join(figs, "vorticity.png"))
	writePNG(t, filepath.Join(figs, "zz-extra.png"))
	var g bytes.Buffer
	gif.EncodeAll(&g, &gif.GIF{Image: []*image.Paletted{image.NewPaletted(image.Rect(0, 0, 2, 2), color.Palette{color.White, color.Black})}, Delay: []int{1}})
	os.WriteFile(filepath.Join(figs, "rollers.gif"), g.Bytes(), 0o644)
	os.WriteFile(filepath.Join(figs, "notes.txt"), []byte("not a figure"), 0o644)
	return dir
}

// selfContained checks that an HTML text loads nothing: no scripts, no
// style sheets, every image a data URI, no address of another machine.
func selfContained(t *testing.T, html string) {
	t.Helper()
	for _, bad := range []string{"<script", "<link", "@import", "<iframe"} {
		if strings.Contains(html, bad) {
			t.Errorf("report holds %s", bad)
		}
	}
	for _, m := range regexp.MustCompile(`(?i)(src|href)\s*=\s*"([^"]*)"`).FindAllStringSubmatch(html, -1) {
		if !strings.HasPrefix(m[2], "data:image/") && !strings.HasPrefix(m[2], "#") {
			t.Errorf("report refers to %s=%q", m[1], m[2])
		}
	}
	if m := regexp.MustCompile(`(?i)(https?|ftp)://`).FindString(html); m != "" {
		t.Errorf("report holds an address of another machine: %s", m)
	}
}

// TestRunReport checks the content of a run's report.html.
// Common practice, no source.
func TestRunReport(t *testing.T) {
	dir := runFolder(t)
	path, err := Write(dir)
	if err != nil {
		t.Fatal(err)
	}
	if path != filepath.Join(dir, runfolder.ReportFile) {
		t.Errorf("path %s", path)
	}
	b, err := os.ReadFile(path)
	if err != nil {
		t.Fatal(err)
	}
	html := string(b)
	selfContained(t, html)
	es, err := runfolder.ReadEntries(dir)
	if err != nil {
		t.Fatal(err)
	}
	for _, e := range es {
		cell := "<td>"
		if _, num := e.Number(); num || e.Value == nil {
			cell = "<td class=\"num\">"
		}
		row := "<tr><td>" + e.Key + "</td>" + cell + templateEscape(runfolder.FormatValue(e.Value)) + "</td><td>" + runfolder.UnitCell(e) + "</td></tr>"
		if !strings.Contains(html, row) {
			t.Errorf("the table lacks %s", row)
		}
	}
	holds(t, "report", html,
		"A &lt;title&gt;",                  // the title, escaped
		"&lt;b&gt;bold&lt;/b&gt; &amp; co", // the case, escaped
		"the flow was still spinning up",
		"<td>flow.bulk_velocity_m_s</td><td class=\"num\">0.125</td><td>m/s</td>",
		"research and teaching model",
		"<b>vorticity.png</b>: The spanwise vorticity",
		"<b>rollers.gif</b>: An animation",
		"data:image/gif;base64,",
		"The figure zz-extra.png")
	if strings.Contains(html, "notes.txt") {
		t.Error("report embeds a file that is not a figure")
	}
	// vorticity first, then rollers.gif, then the figure it does not know.
	if a, b, c := strings.Index(html, "fig-vorticity.png"), strings.Index(html, "fig-rollers.gif"), strings.Index(html, "fig-zz-extra.png"); !(a < b && b < c) {
		t.Errorf("figure order %d %d %d", a, b, c)
	}
}

// templateEscape escapes text as html/template does in element content.
func templateEscape(s string) string {
	return strings.NewReplacer("&", "&amp;", "<", "&lt;", ">", "&gt;", "'", "&#39;", `"`, "&#34;", "+", "&#43;").Replace(s)
}

// TestRunReportWithoutSummary writes the report of a run that has not
// ended: it says what is missing. Common practice, no source.
func TestRunReportWithoutSummary(t *testing.T) {
	dir := t.TempDir()
	os.WriteFile(filepath.Join(dir, runfolder.CaseFile), []byte("title = \"x\"\n"), 0o644)
	path, err := Write(dir)
	if err != nil {
		t.Fatal(err)
	}
	b, _ := os.ReadFile(path)
	holds(t, "report", string(b), "summary.json is missing", "no figures yet", "no summary yet")
	if _, err := Write(t.TempDir()); err == nil || !strings.Contains(err.Error(), "not a run folder") {
		t.Errorf("Write of an empty folder: %v", err)
	}
}

// TestComparisonReport checks report.html of a comparison.
// Common practice, no source.
func TestComparisonReport(t *testing.T) {
	a, b := runFolder(t), runFolder(t)
	cmp, err := runfolder.Compare([]string{a, b})
	if err != nil {
		t.Fatal(err)
	}
	out := t.TempDir()
	fig := filepath.Join(out, "profiles.png")
	writePNG(t, fig)
	path, err := WriteComparison(cmp, []string{fig}, out)
	if err != nil {
		t.Fatal(err)
	}
	bs, _ := os.ReadFile(path)
	html := string(bs)
	selfContained(t, html)
	holds(t, "comparison report", html,
		"Comparison of 2 runs",
		"<th>÷ first</th>",
		"<td>flow.bulk_velocity_m_s</td><td>m/s</td><td class=\"num\">0.125</td><td class=\"num\">0.125</td><td class=\"num\">1</td>",
		"<b>profiles.png</b>: The mean velocity profiles of the runs",
		"research and teaching model")
}

// holds reports each of wants that the text of what lacks.
func holds(t *testing.T, what, text string, wants ...string) {
	t.Helper()
	for _, w := range wants {
		if !strings.Contains(text, w) {
			t.Errorf("%s lacks %q", what, w)
		}
	}
}
