package runs

import (
	"context"
	"math"
	"os"
	"path/filepath"
	"slices"
	"strings"
	"testing"

	"rollerbed/io/h5"
	"rollerbed/io/runfolder"
	"rollerbed/solver"
)

// smallSlabCase is smallCanopyCase as a slab 0.2 m wide on 16 × 8 × 16
// cells, its canopy a rectangle across half the span.
var smallSlabCase = strings.NewReplacer(
	"nx = 32\nnz = 24", "nx = 16\nnz = 16\nwidth = 0.2\nny = 8",
	"duration = 4.0", "duration = 2.0",
	"diameter = 0.004", "diameter = 0.004\n[[canopy.patch]]\nstart = 0.1\nend = 0.3\nspan_start = 0.15\nspan_end = 0.05",
).Replace(smallCanopyCase)

// TestSlabRun: a slab's run folder holds what a slice's does, from span
// averages, plus the volumes, the 3-D sidecar mesh and its summary keys;
// stopped and resumed it gives the same bits.
func TestSlabRun(t *testing.T) {
	sp := parseSpec(t, smallSlabCase)
	if sp.Solver.Ny != 8 || sp.Solver.Ly != 0.2 {
		t.Fatalf("spec Ny %d Ly %g, want 8 and 0.2", sp.Solver.Ny, sp.Solver.Ly)
	}
	dir := filepath.Join(t.TempDir(), "full")
	if _, err := Run(context.Background(), sp, Options{Dir: dir}); err != nil {
		t.Fatal(err)
	}
	sum, err := runfolder.ReadSummary(dir)
	if err != nil {
		t.Fatal(err)
	}
	if sum.Run.Ny != 8 || sum.Run.Width != 0.2 || sum.Flow.SpanCorrelationLength == nil {
		t.Errorf("summary run %+v, span correlation length %v", sum.Run, sum.Flow.SpanCorrelationLength)
	}
	if l := runfolder.Value(sum.Flow.SpanCorrelationLength); !(l > 0 && l <= 0.1+1e-12) {
		t.Errorf("span correlation length %g m: want it in (0, half the span]", l)
	}
	prof, err := runfolder.ReadProfiles(dir)
	if err != nil {
		t.Fatal(err)
	}
	if len(prof.VV) != 16 || slices.Max(prof.VV) <= 0 {
		t.Errorf("profiles.csv v'v' %v: want 16 values, some > 0", prof.VV)
	}
	probes, err := runfolder.ReadProbes(dir)
	if err != nil {
		t.Fatal(err)
	}
	// Four probes on a diagonal: the second at y = Ly/4.
	if p := probes.Probes[1]; p.Y == nil || *p.Y != 0.05 {
		t.Errorf("probe 1 at y %v, want 0.05 m", p.Y)
	}
	fields := filepath.Join(dir, runfolder.FieldsFile)
	snaps, err := h5.ListSnapshots(fields)
	if err != nil {
		t.Fatal(err)
	}
	last := snaps[len(snaps)-1]
	var names []string
	for _, v := range last.Volumes {
		names = append(names, v.Name)
	}
	for _, want := range []string{"u", "v", "w", "p", "vorticity", "nu_t", "oxygen", "q_criterion"} {
		if !slices.Contains(names, want) {
			t.Errorf("volumes %v lack %s", names, want)
		}
	}
	// The x–z field is the span average of the volume, bit for bit (the
	// same sums in the same order).
	u2, err := h5.ReadField(fields, last.Group+"/u")
	if err != nil {
		t.Fatal(err)
	}
	u3, err := h5.ReadVolume(fields, last.Index, "u")
	if err != nil {
		t.Fatal(err)
	}
	if got := spanAverage(u3.Data, 16, 8, 16); !slices.Equal(got, u2.Data) || u2.Rows != 16 || u2.Cols != 16 {
		t.Error("the x–z u is not the span average of the volume u")
	}
	q, err := h5.ReadVolume(fields, last.Index, "q_criterion")
	if err != nil {
		t.Fatal(err)
	}
	if !strings.Contains(q.Source, "Hunt, J. C. R., Wray, A. A. & Moin, P. 1988") {
		t.Errorf("vortex-core source %q", q.Source)
	}
	xmf, err := os.ReadFile(h5.SidecarPath(fields))
	if err != nil || !strings.Contains(string(xmf), `TopologyType="3DRectMesh"`) {
		t.Errorf("sidecar without a 3-D mesh (%v)", err)
	}
	a, err := h5.ReadField(fields, "/canopy/frontal_area")
	if err != nil {
		t.Fatal(err)
	}
	// Derived: the rectangle covers half the span over 0.2 m of 0.4 m, so
	// the span average inside it is half the density, 7.5 1/m.
	if got := a.Data[2*16+8]; math.Abs(got-7.5) > 1e-12 {
		t.Errorf("span-averaged frontal area %g 1/m inside the patch, want 7.5", got)
	}

	// A damaged file is rebuilt by copying what reads back: volumes too.
	gi, err := h5.ReadGrid(fields)
	if err != nil {
		t.Fatal(err)
	}
	fl, err := h5.Create(filepath.Join(t.TempDir(), "fields.h5"), h5.Meta{Title: "copy"})
	if err != nil {
		t.Fatal(err)
	}
	if err := fl.WriteGrid(gi); err != nil {
		t.Fatal(err)
	}
	if kept, lost := salvage(fields, fl, 1e9); kept != len(snaps) || len(lost) != 0 {
		t.Errorf("salvage kept %d of %d snapshots, lost %v", kept, len(snaps), lost)
	}
	fl.Close()
	if v, err := h5.ReadVolume(fl.Path(), last.Index, "q_criterion"); err != nil || !slices.Equal(v.Data, q.Data) {
		t.Errorf("the copied Q criterion differs (%v)", err)
	}

	part := filepath.Join(t.TempDir(), "part")
	ctx, cancel := context.WithCancel(context.Background())
	res, err := Run(ctx, sp, Options{Dir: part, Progress: func(p Progress) {
		if p.SimTime > 1.2 {
			cancel()
		}
	}})
	if err != nil || !res.Interrupted {
		t.Fatalf("interrupted run: %+v, %v", res, err)
	}
	if _, err := Run(context.Background(), sp, Options{Dir: part, Resume: true}); err != nil {
		t.Fatal(err)
	}
	sameOutputs(t, outputs(t, dir), outputs(t, part))
	v1, err := h5.ReadVolume(filepath.Join(part, runfolder.FieldsFile), last.Index, "v")
	if err != nil {
		t.Fatal(err)
	}
	v0, _ := h5.ReadVolume(fields, last.Index, "v")
	if !slices.Equal(v0.Data, v1.Data) {
		t.Error("the resumed run's final v differs")
	}
}

// TestQCriterion: for u = sin(kx x) cos(ky y), v = −(kx/ky) cos(kx x)
// sin(ky y), w = 0 (divergence-free), Q = −½ ∂u_i/∂x_j ∂u_j/∂x_i =
// kx² (sin² kx x sin² ky y − cos² kx x cos² ky y) (derived).
func TestQCriterion(t *testing.T) {
	cfg := solver.Config{Nx: 16, Ny: 8, Nz: 8, Lx: 2, Ly: 1, H: 1, Viscosity: 1e-6, CFL: 0.5, Workers: 1,
		Bed: solver.Wall{Kind: solver.FreeSlip}, Top: solver.Wall{Kind: solver.FreeSlip}}
	s, err := solver.New(cfg)
	if err != nil {
		t.Fatal(err)
	}
	defer s.Close()
	g := s.Grid()
	kx, ky := 2*math.Pi/g.Lx, 2*math.Pi/g.Ly
	np := 16 * 8
	u, v, w := make([]float64, 8*np), make([]float64, 8*np), make([]float64, 9*np)
	for k := range 8 {
		for j := range 8 {
			for i := range 16 {
				x, y := g.X[i], g.Y(j)
				u[(k*8+j)*16+i] = math.Sin(kx*x) * math.Cos(ky*y)
				v[(k*8+j)*16+i] = -(kx / ky) * math.Cos(kx*x) * math.Sin(ky*y)
			}
		}
	}
	if err := s.SetVelocity3(u, v, w); err != nil {
		t.Fatal(err)
	}
	q := QCriterion(s)
	for j := range 8 {
		for i := range 16 {
			x, y := g.X[i], g.Y(j)
			sx, cx, sy, cy := math.Sin(kx*x), math.Cos(kx*x), math.Sin(ky*y), math.Cos(ky*y)
			want := kx * kx * (sx*sx*sy*sy - cx*cx*cy*cy)
			if got := q[(3*8+j)*16+i]; math.Abs(got-want) > 1e-10 {
				t.Fatalf("Q at (%d, %d) = %g, want %g", i, j, got, want)
			}
		}
	}
}

// TestSlabEstimate: a slab's memory comes from its own fitted formula; a
// slab beyond this machine's memory is refused before anything is built,
// naming domain.ny; check's numbers name the spanwise spacing.
func TestSlabEstimate(t *testing.T) {
	sp := parseSpec(t, smallSlabCase)
	cells := 16.0 * 8 * 16
	want := int64(memorySlabFixed) + int64(cells*float64(memorySlabPerCell+memorySlabPerScalarCell))
	if got := MemoryBytes(sp); got != want {
		t.Errorf("slab memory %d bytes, want %d from the slab formula", got, want)
	}
	e, err := EstimateRun(sp)
	if err != nil {
		t.Fatal(err)
	}
	if e.Dy != 0.2/8 || e.KeptModesY != 2 {
		t.Errorf("Δy %g, spanwise modes %d; want 0.025 m and 2", e.Dy, e.KeptModesY)
	}
	if _, ok := physicalMemory(); !ok {
		t.Skip("this system does not say how much memory it has")
	}
	huge := *sp
	huge.Solver.Nx, huge.Solver.Ny, huge.Solver.Nz = 16384, 4096, 8192
	err = CheckMemory(&huge)
	if err == nil || !strings.Contains(err.Error(), "domain.ny = 4096 (with domain.nx = 16384, domain.nz = 8192): the slab needs about") {
		t.Errorf("huge slab: %v", err)
	}
	if _, err := Run(context.Background(), &huge, Options{Dir: filepath.Join(t.TempDir(), "huge")}); err == nil || !strings.Contains(err.Error(), "domain.ny") {
		t.Errorf("run of a huge slab: %v", err)
	}
}

// TestSlabWarnings: a span narrower than two expected roller spacings and
// spanwise cells coarser than a quarter of the penetration depth are
// warned about, each with the fix; a slice gets neither.
func TestSlabWarnings(t *testing.T) {
	// smallCanopyCase: C_D a = 15 1/m, δe = 0.0153 m, spacing 8.1·0.2/15 =
	// 0.108 m (runs.Warnings' estimates).
	c := solver.Config{Ny: 32, Ly: 0.1}
	ws := slabWarnings(c, 0.23/15, canopyRollerSpacing(15))
	if len(ws) != 1 || !strings.Contains(ws[0], "domain.width = 0.1 m holds only 0.9 expected roller spacings") || !strings.Contains(ws[0], "use domain.width = 0.216 m with domain.ny = 70") {
		t.Errorf("narrow span: %q", ws)
	}
	c = solver.Config{Ny: 8, Ly: 0.4}
	ws = slabWarnings(c, 0.23/15, canopyRollerSpacing(15))
	if len(ws) != 1 || !strings.Contains(ws[0], "Δy = 0.05 m is coarse for a penetration depth of 0.0153 m") || !strings.Contains(ws[0], "use domain.ny = 106") {
		t.Errorf("coarse span: %q", ws)
	}
	if ws := slabWarnings(solver.Config{}, 0.01, 0.1); ws != nil {
		t.Errorf("slice: %q", ws)
	}
	sp := parseSpec(t, smallSlabCase)
	found := false
	for _, w := range Warnings(sp) {
		found = found || strings.Contains(w, "Δy = 0.025 m is coarse")
	}
	if !found {
		t.Errorf("Warnings of the small slab lack the spanwise resolution: %q", Warnings(sp))
	}
}

func canopyRollerSpacing(cda float64) float64 { return 8.1 * shearLengthDrag / cda }
