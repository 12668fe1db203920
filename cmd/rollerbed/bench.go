package main

import (
	"encoding/json"
	"fmt"
	"io"
	"text/tabwriter"

	"rollerbed/runs"
)

func cmdBench(args []string, stdout, stderr io.Writer) int {
	fs := newFlags("bench", "[--json] [--steps N]",
		"Times a fixed canopy case with one scalar at 256×64, 512×128 and 1024×256 and, in the same\n"+
			"process, the FFTW transforms one step must make (the yardstick), and prints their ratio,\n"+
			"the speed-up from one to two cores, allocations per step and peak memory.", stderr)
	asJSON := fs.Bool("json", false, "print one JSON object per grid")
	steps := fs.Int("steps", 40, "steps timed per grid and worker count")
	warmup := fs.Int("warmup", 5, "steps run before timing")
	if _, code, ok := parseOrExit(fs, args); !ok {
		return code
	}
	if *steps < 1 || *warmup < 0 {
		return fail(stderr, exitUsage, "--steps must be >= 1 and --warmup >= 0")
	}
	res, err := runs.Bench(runs.BenchGrids, *steps, *warmup, func(g string) {
		if !*asJSON {
			fmt.Fprintf(stderr, "measured %s\n", g)
		}
	})
	if err != nil {
		return fail(stderr, exitFail, "%v", err)
	}
	if *asJSON {
		enc := json.NewEncoder(stdout)
		enc.SetIndent("", "  ")
		if err := enc.Encode(res); err != nil {
			return fail(stderr, exitFail, "%v", err)
		}
		return exitOK
	}
	w := tabwriter.NewWriter(stdout, 0, 4, 2, ' ', tabwriter.AlignRight)
	fmt.Fprintln(w, "grid\tms/step\tms/step 2 cores\tpoints/s\tyardstick ms\tratio\tspeed-up\tallocs/step\tpeak MB\t")
	for _, r := range res {
		fmt.Fprintf(w, "%s\t%.3f\t%.3f\t%.3g\t%.3f\t%.2f\t%.2f\t%.0f\t%.0f\t\n", r.Grid, r.MsPerStep, r.MsPerStep2,
			r.PointUpdatesPerS, r.YardstickMs, r.YardstickRatio, r.Speedup2Cores, r.AllocsPerStep, r.PeakRSSMB)
	}
	w.Flush()
	if len(res) > 0 {
		fmt.Fprintf(stdout, "\nyardstick: %d forward and %d inverse single-field FFTW transforms per step (RK3, 3 stages, u, w and one scalar)\n",
			res[0].Forward, res[0].Inverse)
	}
	return exitOK
}
