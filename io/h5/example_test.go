package h5_test

import (
	"fmt"
	"log"
	"os"
	"path/filepath"
	"time"

	"rollerbed/io/h5"
)

// A run writes its grid, the canopy, and a snapshot now and then; the
// sidecar fields.xmf beside fields.h5 opens the series in a viewer.
func ExampleCreate() {
	dir, err := os.MkdirTemp("", "run-")
	if err != nil {
		log.Fatal(err)
	}
	defer os.RemoveAll(dir)

	const nx, nz = 4, 2 // points in x, cells in z
	fields, err := h5.Create(filepath.Join(dir, "fields.h5"), h5.Meta{
		Title:    "dowel array, demo",
		Version:  "rollerbed dev",
		CaseText: "[domain]\nlength = 0.4\n",
		Seed:     1,
		Started:  time.Date(2025, 1, 6, 9, 0, 0, 0, time.UTC),
		Compress: 4,
	})
	if err != nil {
		log.Fatal(err)
	}
	grid := h5.GridInfo{
		X:  []float64{0, 0.1, 0.2, 0.3},
		Zc: []float64{0.025, 0.075},
		Zf: []float64{0, 0.05, 0.1},
		Lx: 0.4, H: 0.1,
	}
	if err := fields.WriteGrid(grid); err != nil {
		log.Fatal(err)
	}
	a := []float64{10, 10, 10, 10, 0, 0, 0, 0} // 1/m, canopy in the lower cell
	if err := fields.WriteStatic("/canopy/frontal_area", a, nz, nx, "1/m", "frontal area per unit volume"); err != nil {
		log.Fatal(err)
	}
	for n, t := range []float64{0.5, 1.0} {
		u := make([]float64, nz*nx)
		w := make([]float64, (nz+1)*nx)
		for i := range u {
			u[i] = 0.1 * t
		}
		err := fields.WriteSnapshot(t, 100*(n+1), []h5.Field{
			{Name: "u", Units: "m/s", Description: "streamwise velocity", Data: u, Rows: nz, Cols: nx, Location: h5.LocationCentre},
			{Name: "w", Units: "m/s", Description: "vertical velocity", Data: w, Rows: nz + 1, Cols: nx, Location: h5.LocationFace},
		})
		if err != nil {
			log.Fatal(err)
		}
	}
	if err := fields.Close(); err != nil {
		log.Fatal(err)
	}

	snaps, err := h5.ListSnapshots(fields.Path())
	if err != nil {
		log.Fatal(err)
	}
	for _, s := range snaps {
		fmt.Printf("%s t = %g s, step %d, %d fields\n", s.Group, s.Time, s.Step, len(s.Fields))
	}
	u, err := h5.ReadField(fields.Path(), "/snapshots/000001/u")
	if err != nil {
		log.Fatal(err)
	}
	fmt.Println(u.Name, u.Rows, "×", u.Cols, u.Units, u.Data[0])
	fmt.Println(filepath.Base(h5.SidecarPath(fields.Path())))
	// Output:
	// /snapshots/000000 t = 0.5 s, step 100, 2 fields
	// /snapshots/000001 t = 1 s, step 200, 2 fields
	// u 2 × 4 m/s 0.1
	// fields.xmf
}

// On resume, the run reads the newest valid checkpoint and cuts the
// fields file back to the checkpoint's time.
func ExampleReadCheckpoint() {
	dir, err := os.MkdirTemp("", "run-")
	if err != nil {
		log.Fatal(err)
	}
	defer os.RemoveAll(dir)

	for _, steps := range []int{1000, 2000, 3000} {
		cp := &h5.Checkpoint{
			Time: 0.001 * float64(steps), Steps: steps, LastStep: 0.001, Gradient: -1e-4,
			CaseText: "[domain]\nlength = 0.4\n", Version: "rollerbed dev",
			Arrays:  map[string][]float64{"u": {0.1, 0.2}, "w": {0, 0, 0}},
			Complex: map[string][]complex128{"pressure": {1 + 2i}},
		}
		if err := h5.WriteCheckpoint(dir, cp); err != nil {
			log.Fatal(err)
		}
	}
	cp, file, err := h5.ReadCheckpoint(dir)
	if err != nil {
		log.Fatal(err)
	}
	for _, w := range cp.Warnings {
		fmt.Println("warning:", w)
	}
	fmt.Println(filepath.Base(file), cp.Steps, cp.Time, cp.Arrays["u"], cp.Complex["pressure"])
	entries, _ := os.ReadDir(dir)
	fmt.Println(len(entries), "checkpoints kept")
	// Output:
	// checkpoint-000003000.h5 3000 3 [0.1 0.2] [(1+2i)]
	// 2 checkpoints kept
}
