package main

import (
	"bytes"
	"context"
	"image/png"
	"net/url"
	"os"
	"path/filepath"
	"strings"
	"testing"
	"time"

	"github.com/chromedp/chromedp"

	"rollerbed/internal/headless"
	"rollerbed/io/htmlreport"
	"rollerbed/io/livepage"
	"rollerbed/io/report"
	"rollerbed/io/runfolder"
	"rollerbed/runs"
)

// screenshotsEnv names a folder where the browser tests save screenshots
// of the live page and of report.html (for the README); unset, they save
// none.
const screenshotsEnv = "ROLLERBED_SCREENSHOTS"

// TestPagesInBrowser runs a small canopy case with its live page and
// looks at the page in headless Chromium as a person would: the map of
// the vorticity is drawn and changes while the case runs, the progress
// advances, the metrics are listed, nothing goes to the console as an
// error and no request leaves the machine. It then stops the run, writes
// the figures and report.html, and opens the report from its file: the
// summary table holds the summary's numbers and every figure shows.
// Common practice, no source.
func TestPagesInBrowser(t *testing.T) {
	if testing.Short() {
		t.Skip("starts a browser")
	}
	dir := filepath.Join(t.TempDir(), "live")
	path := filepath.Join(t.TempDir(), "case.toml")
	long := strings.Replace(smallCase, "duration = 3.0", "duration = 400.0", 1)
	if err := os.WriteFile(path, []byte(long), 0o644); err != nil {
		t.Fatal(err)
	}
	_, sp, err := loadCase(path)
	if err != nil {
		t.Fatal(err)
	}
	ln, err := livepage.Listen("127.0.0.1:0", false)
	if err != nil {
		t.Fatal(err)
	}
	srv := livepage.Start(ln, dir)
	defer srv.Close()

	p := headless.Browser(t, 3*time.Minute)
	ctx, stop := context.WithCancel(context.Background())
	defer stop()
	done := make(chan error, 1)
	go func() {
		_, err := runs.Run(ctx, sp, runs.Options{Dir: dir, WatchEvery: 100 * time.Millisecond,
			Watch: func(f *runs.Frame) { srv.Publish(frameView(f)) }})
		done <- err
	}()
	if err := chromedp.Do(p.Ctx, chromedp.Navigate(srv.URL()),
		chromedp.Poll[chromedp.Void]("window.rollerbed.views >= 1 && document.getElementById('map-vorticity') !== null")); err != nil {
		t.Fatalf("the live page shows no map: %v", err)
	}
	shot1, t1, prog1 := liveState(t, p)
	// Wait for a later view, then take the second picture.
	if err := chromedp.Do(p.Ctx, chromedp.Poll[chromedp.Void]("window.rollerbed.time > "+jsNumber(t1)+" + 0.05")); err != nil {
		t.Fatalf("the live page did not advance from t = %g s: %v", t1, err)
	}
	// The map is drawn after its image loads: give it a moment.
	time.Sleep(300 * time.Millisecond)
	shot2, t2, prog2 := liveState(t, p)
	if colours(t, shot1) < 20 {
		t.Errorf("the first picture of the map has %d colours: it is not drawn", colours(t, shot1))
	}
	if bytes.Equal(shot1, shot2) {
		t.Errorf("the map did not change between t = %g s and t = %g s", t1, t2)
	}
	if !(prog2 > prog1) {
		t.Errorf("the progress bar did not advance: %g then %g", prog1, prog2)
	}
	state, err := chromedp.Run(p.Ctx, chromedp.Text(chromedp.CSS("#state")))
	if err != nil || state != string(livepage.Running) {
		t.Errorf("the state reads %q (%v), want %q", state, err, livepage.Running)
	}
	rows, err := chromedp.Run(p.Ctx, chromedp.Evaluate[[]string](`[...document.querySelectorAll("#metrics tbody tr")].map(r => r.dataset.key)`))
	if err != nil || !containsAll(rows, runfolder.KeyPenetrationDepth, "flow.roller_frequency_hz") {
		t.Errorf("the metrics table lists %v (%v); want the penetration depth and the roller frequency", rows, err)
	}
	saveScreenshot(t, p, "live-page.png")
	stop()
	if err := <-done; err != nil {
		t.Fatalf("run: %v", err)
	}
	pageClean(t, p, "the live page")

	// The report of the same folder, opened from its file.
	if _, _, err := report.WriteFigures(dir); err != nil {
		t.Fatal(err)
	}
	rep, err := htmlreport.Write(dir)
	if err != nil {
		t.Fatal(err)
	}
	abs, _ := filepath.Abs(rep)
	if err := chromedp.Do(p.Ctx, chromedp.Navigate((&url.URL{Scheme: "file", Path: abs}).String()),
		chromedp.Poll[chromedp.Void](`[...document.images].every(i => i.complete)`)); err != nil {
		t.Fatal(err)
	}
	shown, err := chromedp.Run(p.Ctx, chromedp.Evaluate[[]bool](`[...document.images].map(i => i.naturalWidth > 0)`))
	if err != nil || len(shown) == 0 {
		t.Fatalf("report.html shows no figures (%v)", err)
	}
	for i, ok := range shown {
		if !ok {
			t.Errorf("figure %d of report.html does not show", i)
		}
	}
	cells, err := chromedp.Run(p.Ctx, chromedp.Evaluate[[][]string](`[...document.querySelectorAll("#summary tbody tr")].map(r => [...r.cells].map(c => c.textContent))`))
	if err != nil {
		t.Fatal(err)
	}
	table := map[string][]string{}
	for _, c := range cells {
		table[c[0]] = c[1:]
	}
	es, err := runfolder.ReadEntries(dir)
	if err != nil {
		t.Fatal(err)
	}
	checked := 0
	for _, e := range es {
		if strings.HasPrefix(e.Key, "provenance.") {
			continue
		}
		got, ok := table[e.Key]
		want := []string{runfolder.FormatValue(e.Value), runfolder.UnitCell(e)}
		if !ok || got[0] != want[0] || got[1] != want[1] {
			t.Errorf("report.html shows %s as %q, want %q", e.Key, got, want)
		}
		checked++
	}
	if checked < 10 {
		t.Errorf("only %d summary keys checked", checked)
	}
	saveScreenshot(t, p, "report.png")
	pageClean(t, p, "report.html")
}

// liveState returns a PNG screenshot of the vorticity map, the simulated
// time the page shows and its progress bar's value.
func liveState(t *testing.T, p *headless.Page) (shot []byte, time, progress float64) {
	t.Helper()
	shot, err := chromedp.Run(p.Ctx, chromedp.Screenshot(chromedp.CSS("#map-vorticity")))
	if err != nil {
		t.Fatal(err)
	}
	if time, err = chromedp.Run(p.Ctx, chromedp.Evaluate[float64]("window.rollerbed.time")); err != nil {
		t.Fatal(err)
	}
	if progress, err = chromedp.Run(p.Ctx, chromedp.Evaluate[float64]("document.getElementById('progress').value")); err != nil {
		t.Fatal(err)
	}
	return shot, time, progress
}

// colours counts the distinct colours of a PNG.
func colours(t *testing.T, b []byte) int {
	t.Helper()
	img, err := png.Decode(bytes.NewReader(b))
	if err != nil {
		t.Fatal(err)
	}
	seen := map[[3]uint32]bool{}
	r := img.Bounds()
	for y := r.Min.Y; y < r.Max.Y; y += 2 {
		for x := r.Min.X; x < r.Max.X; x += 2 {
			cr, cg, cb, _ := img.At(x, y).RGBA()
			seen[[3]uint32{cr, cg, cb}] = true
		}
	}
	return len(seen)
}

// pageClean reports console errors and requests that left the machine.
func pageClean(t *testing.T, p *headless.Page, what string) {
	t.Helper()
	for _, e := range p.Errors() {
		t.Errorf("%s: %s", what, e)
	}
	for _, r := range p.ForeignRequests() {
		t.Errorf("%s asked another machine for %s", what, r)
	}
}

// saveScreenshot saves a screenshot of the whole page under the folder
// that screenshotsEnv names, if any.
func saveScreenshot(t *testing.T, p *headless.Page, name string) {
	t.Helper()
	dir := os.Getenv(screenshotsEnv)
	if dir == "" {
		return
	}
	b, err := chromedp.Run(p.Ctx, chromedp.FullScreenshot(100))
	if err != nil {
		t.Fatal(err)
	}
	if err := os.WriteFile(filepath.Join(dir, name), b, 0o644); err != nil {
		t.Fatal(err)
	}
}

func containsAll(list []string, want ...string) bool {
	for _, w := range want {
		found := false
		for _, l := range list {
			found = found || l == w
		}
		if !found {
			return false
		}
	}
	return true
}

// jsNumber writes a number for a script.
func jsNumber(v float64) string { return strings.TrimSpace(runfolder.FormatNumber(v, 17)) }
