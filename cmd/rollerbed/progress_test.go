package main

import (
	"bytes"
	"context"
	"strings"
	"testing"
	"time"

	"rollerbed/io/casefile"
	"rollerbed/runs"
)

// TestProgressBarShowsItsOwnTime: the bar's percentage and the simulated
// time beside it come from the same report (common practice, no source).
func TestProgressBarShowsItsOwnTime(t *testing.T) {
	var b bytes.Buffer
	p := newProgressPrinterFor(&b, true)
	p.show(runs.Progress{SimTime: 4.834, EndTime: 40, Steps: 10})
	p.show(runs.Progress{SimTime: 20, EndTime: 40, Steps: 20})
	frames := strings.Split(b.String(), "\r")
	last := frames[len(frames)-1]
	if !strings.Contains(last, "50%") || !strings.Contains(last, "t = 20 / 40 s") {
		t.Errorf("last frame %q: want 50%% beside t = 20 / 40 s", last)
	}
}

// TestFirstProgressComesAtOnce: off a terminal the first progress line
// comes after the first step, not after the first ten seconds.
func TestFirstProgressComesAtOnce(t *testing.T) {
	sp, err := loadSpecText(strings.Replace(smallCase, "duration = 3.0", "duration = 0.5", 1))
	if err != nil {
		t.Fatal(err)
	}
	var got []runs.Progress
	opt := runs.Options{Dir: t.TempDir(), ProgressEvery: time.Hour, Progress: func(p runs.Progress) { got = append(got, p) }}
	if _, err := runs.Run(context.Background(), sp, opt); err != nil {
		t.Fatal(err)
	}
	if len(got) < 2 || got[0].Steps != 1 {
		t.Errorf("progress reports %+v: want the first after step 1 and one at the end", got)
	}
}

func loadSpecText(text string) (*runs.Spec, error) {
	c, err := casefile.Parse([]byte(text))
	if err != nil {
		return nil, err
	}
	return runs.FromCase(c, "")
}
