package main

import (
	"encoding/json"
	"fmt"
	"io"
	"strings"
	"text/tabwriter"

	"rollerbed/runs"
)

func cmdBench(args []string, stdout, stderr io.Writer) int {
	fs := newFlags("bench", "[--json] [--steps N] [--grid NXxNZ,...]",
		"Times a fixed canopy case with one scalar at 256×64, 512×128 and 1024×256 and, in the same\n"+
			"process, the FFTW transforms one step must make (the yardstick), and prints their ratio,\n"+
			"the speed-up from one to two cores, allocations per step and peak memory.", stdout, stderr)
	asJSON := fs.Bool("json", false, "print one JSON object per grid")
	steps := fs.Int("steps", 40, "`N` steps timed per grid and worker count")
	warmup := fs.Int("warmup", 5, "`N` steps run before timing")
	only := fs.String("grid", "", "measure only these `GRIDS`, e.g. 512x128 or 256x64,1024x256")
	if _, code, ok := fs.parse(args); !ok {
		return code
	}
	if *steps < 1 || *warmup < 0 {
		return fail(stderr, exitUsage, "--steps must be >= 1 and --warmup >= 0")
	}
	grids := runs.BenchGrids
	if *only != "" {
		var err error
		if grids, err = parseGrids(*only); err != nil {
			return fail(stderr, exitUsage, "%v", err)
		}
	}
	res, err := runs.Bench(grids, *steps, *warmup, func(g string) {
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
	fmt.Fprintln(w, "grid\tms/step\tms/step 2 cores\tpoints/s\tyardstick ms\tratio\tspeed-up\tyardstick speed-up\tallocs/step\tpeak MB\t")
	for _, r := range res {
		fmt.Fprintf(w, "%s\t%.3f\t%.3f\t%.3g\t%.3f\t%.2f\t%.2f\t%.2f\t%.0f\t%.0f\t\n", r.Grid, r.MsPerStep, r.MsPerStep2,
			r.PointUpdatesPerS, r.YardstickMs, r.YardstickRatio, r.Speedup2Cores, r.YardstickSpeedup2Cores, r.AllocsPerStep, r.PeakRSSMB)
	}
	w.Flush()
	if len(res) > 0 {
		fmt.Fprintf(stdout, "\nyardstick: %d forward and %d inverse single-field FFTW transforms per step (RK3, 3 stages, u, w and one scalar)\n",
			res[0].Forward, res[0].Inverse)
		fmt.Fprintln(stdout, "ratio: one-worker step over its yardstick; speed-up: one-worker over two-worker step time;")
		fmt.Fprintln(stdout, "yardstick speed-up: the same for the transforms alone, what this machine's second core gives them now")
	}
	return exitOK
}

// parseGrids reads a comma-separated list of grids written NXxNZ.
func parseGrids(list string) ([][2]int, error) {
	var out [][2]int
	for _, g := range strings.Split(list, ",") {
		var nx, nz int
		var rest string
		n, _ := fmt.Sscanf(strings.TrimSpace(g)+" end", "%dx%d %s", &nx, &nz, &rest)
		if n != 3 || rest != "end" || nx < 8 || nz < 8 || nx%2 != 0 {
			return nil, fmt.Errorf("--grid %q: write each grid as NXxNZ with an even NX >= 8 and NZ >= 8, e.g. --grid 512x128", g)
		}
		out = append(out, [2]int{nx, nz})
	}
	return out, nil
}
