package report_test

import (
	"encoding/json"
	"math"
	"os"
	"path/filepath"
	"strings"
	"testing"

	"rollerbed/io/report"
	"rollerbed/io/runfolder"
)

// The spectra of compared runs are labelled by where their probes are (a
// run without canopy has no canopy top), and each peak is marked: a dot
// on the curve within the resolved band, a ring at its edge outside it.
func TestSpectraLabelsAndPeaks(t *testing.T) {
	a, b := sharedRuns(t)
	bare := copyRun(t, b, runfolder.CaseFile, runfolder.SpectrumFile)
	raw, err := os.ReadFile(filepath.Join(b, runfolder.SummaryFile))
	if err != nil {
		t.Fatal(err)
	}
	var m map[string]any
	json.Unmarshal(raw, &m)
	delete(m, "canopy")
	m["flow"].(map[string]any)["canopy_height_m"] = nil
	m["spectrum"].(map[string]any)["probe_height_m"] = 0.1
	out, _ := json.Marshal(m)
	os.WriteFile(filepath.Join(bare, runfolder.SummaryFile), out, 0o644)

	s, err := report.SpectraOf(a, bare)
	if err != nil {
		t.Fatal(err)
	}
	if len(s.Labels) != 2 || !strings.Contains(s.Labels[0], "probes at z = 0.08 m (canopy top)") ||
		!strings.Contains(s.Labels[1], "probes at z = 0.1 m") || strings.Contains(s.Labels[1], "canopy") {
		t.Errorf("labels %q", s.Labels)
	}
	if strings.Contains(s.Title, "canopy-top") {
		t.Errorf("title %q promises canopy-top probes", s.Title)
	}
	if len(s.Peaks) != 2 {
		t.Fatalf("%d peak marks, want 2", len(s.Peaks))
	}
	for i, dir := range []string{a, bare} {
		sp, err := runfolder.ReadSpectrum(dir)
		if err != nil {
			t.Fatal(err)
		}
		peak, _ := report.SpectrumPeak(dir)
		mk := s.Peaks[i]
		lo, hi := sp.Freq[1], sp.Freq[len(sp.Freq)-1]
		in := peak >= lo && peak <= hi
		if mk.F != peak || !(mk.S > 0) || mk.Dot != in {
			t.Errorf("run %d: mark at %v Hz (dot %v), peak %v Hz, band %v–%v Hz", i, mk.F, mk.Dot, peak, lo, hi)
		}
		if !in && !strings.Contains(s.Labels[i], "outside the resolved band") {
			t.Errorf("run %d: label %q does not say the peak is outside the band", i, s.Labels[i])
		}
		if in {
			// On the curve: between the densities of the bins around it.
			for k := 1; k < len(sp.Freq); k++ {
				if sp.Freq[k] >= peak {
					lo, hi := math.Min(sp.PSD[k-1], sp.PSD[k]), math.Max(sp.PSD[k-1], sp.PSD[k])
					if mk.S < lo*(1-1e-9) || mk.S > hi*(1+1e-9) {
						t.Errorf("run %d: dot at S = %v, the curve is between %v and %v there", i, mk.S, lo, hi)
					}
					break
				}
			}
		}
	}
}
