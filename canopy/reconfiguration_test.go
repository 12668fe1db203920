package canopy

import (
	"math"
	"strings"
	"testing"
)

// TestEffectiveLengthLimits checks the reconfiguration law against its
// published limits (Luhar & Nepf 2011, Limnol. Oceanogr. 56:2003, from
// memory): stiff blades keep their length (l_e/l → 1 as Ca → 0), and very
// flexible ones follow l_e/l ≈ 0.9 Ca^(−1/3); buoyancy stands blades up,
// so l_e/l grows with B at fixed Ca.
func TestEffectiveLengthLimits(t *testing.T) {
	for _, ca := range []float64{1e-12, 1e-8, 1e-4} {
		if got := math.Min(EffectiveLength(ca, 0), 1); math.Abs(got-1) > 1e-4 {
			t.Errorf("Ca = %g: l_e/l = %g, want 1", ca, got)
		}
		if got := math.Min(BentHeight(ca, 0), 1); math.Abs(got-1) > 1e-4 {
			t.Errorf("Ca = %g: h_d/l = %g, want 1", ca, got)
		}
	}
	for _, ca := range []float64{1e3, 1e4, 1e6} {
		want := 0.9 * math.Pow(ca, -1.0/3)
		if got := EffectiveLength(ca, 0); math.Abs(got/want-1) > 0.01 {
			t.Errorf("Ca = %g: l_e/l = %g, want 0.9 Ca^(-1/3) = %g within 1 %%", ca, got, want)
		}
	}
	for _, ca := range []float64{1e6, 1e8} {
		// The bent height falls as Ca^(−1/4) (Luhar & Nepf 2013, Adv.
		// Water Resour. 51:305, from memory), reached slowly.
		if got, want := BentHeight(ca, 0), math.Pow(ca, -0.25); math.Abs(got/want-1) > 0.05 {
			t.Errorf("Ca = %g: h_d/l = %g, want Ca^(-1/4) = %g within 5 %%", ca, got, want)
		}
	}
	prevLe, prevH := 2.0, 2.0
	for _, ca := range []float64{0.1, 1, 3, 10, 30, 100, 300, 1000} {
		le, h := EffectiveLength(ca, 1), BentHeight(ca, 1)
		if !(le < prevLe && h < prevH) || le <= 0 || h <= 0 {
			t.Errorf("Ca = %g: l_e/l = %g, h_d/l = %g: want both in (0, 1] and falling with Ca", ca, le, h)
		}
		prevLe, prevH = le, h
		if ca >= 1 && EffectiveLength(ca, 10) <= EffectiveLength(ca, 0.1) {
			t.Errorf("Ca = %g: buoyancy does not raise l_e/l", ca)
		}
	}
}

func TestFlexibleNumbers(t *testing.T) {
	f := Flexible{Modulus: 1e9, Thickness: 1e-3, Density: 900}
	b, l := 0.01, 0.2
	ei := 1e9 * b * 1e-9 / 12
	if got := f.Rigidity(b); math.Abs(got/ei-1) > 1e-15 {
		t.Errorf("EI = %g, want %g", got, ei)
	}
	// Ca = ρ C_D b U² l³ / (2EI), B = (ρ − ρ_v) g b t l³ / (EI) (definitions).
	if got, want := f.CauchyNumber(1000, 1.5, b, l, 0.3), 1000*1.5*b*0.09*0.008/(2*ei); math.Abs(got/want-1) > 1e-14 {
		t.Errorf("Ca = %g, want %g", got, want)
	}
	if got, want := f.BuoyancyNumber(1000, b, l), 100*Gravity*b*1e-3*0.008/ei; math.Abs(got/want-1) > 1e-14 {
		t.Errorf("B = %g, want %g", got, want)
	}
}

func TestFlexibleValidate(t *testing.T) {
	good := Flexible{Modulus: 1e9, Thickness: 1e-3, Density: 900}
	tests := []struct {
		name   string
		f      Flexible
		rho, b float64
		want   string
	}{
		{"modulus zero", Flexible{0, 1e-3, 900}, 1000, 0.01, "blade modulus E = 0 Pa"},
		{"thickness negative", Flexible{1e9, -1, 900}, 1000, 0.01, "blade thickness t = -1 m"},
		{"thicker than wide", good, 1000, 1e-3, "not below the blade width"},
		{"no width", good, 1000, 0, "blade width b > 0"},
		{"heavier than the fluid", Flexible{1e9, 1e-3, 1300}, 1000, 0.01, "need 0 < ρ_v <= ρ"},
		{"no fluid density", good, 0, 0.01, "fluid density 0"},
	}
	for _, tt := range tests {
		t.Run(tt.name, func(t *testing.T) {
			err := tt.f.Validate(tt.rho, tt.b)
			if err == nil || !strings.Contains(err.Error(), tt.want) || !strings.HasPrefix(err.Error(), "canopy: ") {
				t.Errorf("error %v, want one containing %q", err, tt.want)
			}
		})
	}
	if err := good.Validate(1000, 0.01); err != nil {
		t.Error(err)
	}
}

// bladeMeadow is a demo meadow of flat blades 0.2 m long on a 0.5 m deep
// slice, half covered by a patch, on a stretched mesh.
func bladeMeadow(t *testing.T) (*Canopy, Mesh, []float64) {
	t.Helper()
	c := &Canopy{Profile: Block(0.2, 5), Elements: Elements{Shape: Blade, Width: 0.005}, CD: 1.2,
		Patches: []Patch{{X0: 0.25, X1: 0.75}}}
	m := UniformMesh(16, 40, 1, 0.5)
	for j := range m.Zf {
		s := float64(j) / 40
		m.Zf[j] = 0.5 * s * s
	}
	if err := c.Validate(m.Lx, m.H); err != nil {
		t.Fatal(err)
	}
	return c, m, c.DragArea(m)
}

// TestBendingRigidLimit: blades stiff enough to stand upright at any speed
// give the rigid canopy's drag array bit for bit (derived).
func TestBendingRigidLimit(t *testing.T) {
	c, m, half := bladeMeadow(t)
	rigid := append([]float64(nil), half...)
	bd, err := NewBending(c, Flexible{Modulus: 1e30, Thickness: 1e-3, Density: 1000}, m, 1025, half)
	if err != nil {
		t.Fatal(err)
	}
	u := make([]float64, len(half))
	for i := range u {
		u[i] = 0.5 + 0.1*math.Sin(float64(i))
	}
	bd.Update(u, nil)
	for i := range half {
		if half[i] != rigid[i] {
			t.Fatalf("value %d: %v after bending, %v rigid", i, half[i], rigid[i])
		}
	}
	if math.Abs(bd.MeanHeight()-0.2) > 1e-15 || bd.MeanLengthRatio() != 1 {
		t.Errorf("mean height %g, l_e/l %g: want 0.2, 1", bd.MeanHeight(), bd.MeanLengthRatio())
	}
}

// TestBendingSqueeze: a bent column holds no frontal area above the bent
// height, and its frontal area index is the rigid one times l_e/l (derived
// from the squeeze in Bending's doc).
func TestBendingSqueeze(t *testing.T) {
	c, m, half := bladeMeadow(t)
	rigid := append([]float64(nil), half...)
	flex := Flexible{Modulus: 5e8, Thickness: 2e-4, Density: 900}
	bd, err := NewBending(c, flex, m, 1025, half)
	if err != nil {
		t.Fatal(err)
	}
	nx, nz := len(m.X), len(m.Zf)-1
	// The rigid cell values are constant over their cells: the squeezed
	// column reaches h_d/l times the top face of the highest cell.
	ztop := 0.0
	for _, z := range m.Zf {
		if z >= 0.2 {
			ztop = z
			break
		}
	}
	for _, speed := range []float64{0, 0.05, 0.2, 0.6} {
		u := make([]float64, len(half))
		for i := range u {
			u[i] = -speed // the direction does not matter
		}
		bd.Update(u, nil)
		ca := flex.CauchyNumber(1025, 1.2, 0.005, 0.2, speed)
		wantH := 0.2 * math.Min(BentHeight(ca, bd.Buoyancy()), 1)
		wantE := math.Min(EffectiveLength(ca, bd.Buoyancy()), 1)
		for i := range nx {
			var bent, upright float64
			for k := range nz {
				dz := m.Zf[k+1] - m.Zf[k]
				bent += half[k*nx+i] * dz
				upright += rigid[k*nx+i] * dz
				if m.Zf[k] >= wantH*ztop/0.2 && half[k*nx+i] != 0 {
					t.Errorf("U = %g: column %d has frontal area at z = %g m, above the bent height %g m", speed, i, m.Zf[k], wantH)
				}
			}
			if math.Abs(bent-wantE*upright) > 1e-12*upright {
				t.Errorf("U = %g: column %d: ∫½a dz = %g, want l_e/l = %g times %g", speed, i, bent, wantE, upright)
			}
			if upright > 0 && bd.Heights()[i] != wantH {
				t.Errorf("U = %g: column %d bent height %g, want %g", speed, i, bd.Heights()[i], wantH)
			}
		}
		if speed > 0 && !(bd.MeanHeight() < 0.2) {
			t.Errorf("U = %g: mean height %g, want below 0.2 m", speed, bd.MeanHeight())
		}
	}
	u := make([]float64, len(half))
	if n := testing.AllocsPerRun(10, func() { bd.Update(u, nil) }); n != 0 {
		t.Errorf("Update allocates %v times", n)
	}
}

func TestNewBendingRefuses(t *testing.T) {
	c, m, half := bladeMeadow(t)
	flex := Flexible{Modulus: 5e8, Thickness: 2e-4, Density: 900}
	cyl := *c
	cyl.Elements.Shape = Cylinder
	law := *c
	law.CD, law.Law = 0, WhiteCylinder
	for _, tt := range []struct {
		name string
		c    *Canopy
		want string
	}{{"cylinders", &cyl, "need flat blades"}, {"a drag law", &law, "fixed drag coefficient"}} {
		if _, err := NewBending(tt.c, flex, m, 1025, half); err == nil || !strings.Contains(err.Error(), tt.want) {
			t.Errorf("%s: error %v, want one containing %q", tt.name, err, tt.want)
		}
	}
}
