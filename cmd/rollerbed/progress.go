package main

import (
	"fmt"
	"io"
	"os"
	"time"

	"github.com/schollz/progressbar/v3"

	"rollerbed/runs"
)

// progressPrinter shows the progress of a run: a progress bar over the
// simulated time on a terminal, a plain line every ten seconds otherwise.
type progressPrinter struct {
	w        io.Writer
	terminal bool
	bar      *progressbar.ProgressBar
}

// barSteps is the resolution of the progress bar.
const barSteps = 1000

func newProgressPrinter(w io.Writer) *progressPrinter {
	return newProgressPrinterFor(w, isTerminal(w))
}

// isTerminal tells whether w is a terminal.
func isTerminal(w io.Writer) bool {
	f, ok := w.(*os.File)
	if !ok {
		return false
	}
	st, err := f.Stat()
	return err == nil && st.Mode()&os.ModeCharDevice != 0
}

// newProgressPrinterFor shows progress on w as a bar (terminal) or as
// plain lines.
func newProgressPrinterFor(w io.Writer, terminal bool) *progressPrinter {
	p := &progressPrinter{w: w, terminal: terminal}
	if p.terminal {
		p.bar = progressbar.NewOptions(barSteps,
			progressbar.OptionSetWriter(w),
			progressbar.OptionSetWidth(30),
			progressbar.OptionSetPredictTime(false),
			progressbar.OptionShowDescriptionAtLineEnd(),
		)
	}
	return p
}

func (p *progressPrinter) every() time.Duration {
	if p.terminal {
		return 200 * time.Millisecond
	}
	return 10 * time.Second
}

func (p *progressPrinter) show(pr runs.Progress) {
	frac := 0.0
	if pr.EndTime > 0 {
		frac = pr.SimTime / pr.EndTime
	}
	desc := fmt.Sprintf("t = %.4g / %.4g s  step %d  dt %.3g s  %.1f steps/s  ETA %s",
		pr.SimTime, pr.EndTime, pr.Steps, pr.Dt, pr.StepsPerSecond, pr.ETA.Round(time.Second))
	if p.bar != nil {
		// The run already reports every 200 ms, so the bar draws at each
		// call, unthrottled: a throttled bar would draw the value of one
		// report beside the text of another.
		p.bar.Set(int(frac * barSteps))
		p.bar.Describe(desc)
		return
	}
	fmt.Fprintf(p.w, "%3.0f%%  %s\n", 100*frac, desc)
}

func (p *progressPrinter) done() {
	if p.bar != nil {
		p.bar.Finish()
		fmt.Fprintln(p.w)
	}
}
