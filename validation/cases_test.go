package validation

import (
	"math"
	"testing"

	"rollerbed/solver"
)

// TestBrinkmanExact checks the two-layer solution itself: ν U″ − λU + Π = 0
// in the layer, ν U″ + Π = 0 above it, U(0) = 0, U and U′ continuous at h,
// and the top condition, by central differences (derived).
func TestBrinkmanExact(t *testing.T) {
	for _, b := range []brinkman{{"open", solver.FreeSlip}, {"closed", solver.NoSlip}} {
		t.Run(b.name, func(t *testing.T) {
			scale := b.peak()
			d := 1e-4 * brH
			for _, z := range []float64{0.05, 0.2, 0.37, 0.45, 0.55, 0.7, 0.93} {
				d2 := (b.exact(z+d) - 2*b.exact(z) + b.exact(z-d)) / (d * d)
				lambda := 0.0
				if z < brLayer {
					lambda = brLambda
				}
				res := (brNu*d2 - lambda*b.exact(z) + brGradient) / brGradient
				if math.Abs(res) > 1e-5 {
					t.Errorf("z = %g m: residual %.3g of Π", z, res)
				}
			}
			if u := b.exact(0); math.Abs(u) > 1e-14*scale {
				t.Errorf("U(0) = %g", u)
			}
			e := 1e-9
			if jump := b.exact(brLayer+e) - b.exact(brLayer-e); math.Abs(jump) > 1e-7*scale {
				t.Errorf("U jumps by %g at h", jump)
			}
			below := (b.exact(brLayer) - b.exact(brLayer-d)) / d
			above := (b.exact(brLayer+d) - b.exact(brLayer)) / d
			if math.Abs(below-above) > 1e-3*math.Abs(above) {
				t.Errorf("U′ jumps at h: %g below, %g above", below, above)
			}
			if b.top == solver.FreeSlip {
				if s := (b.exact(brH) - b.exact(brH-d)) / d; math.Abs(s) > 1e-3*scale/brH {
					t.Errorf("U′(H) = %g, want 0", s)
				}
			} else if u := b.exact(brH); math.Abs(u) > 1e-12*scale {
				t.Errorf("U(H) = %g, want 0", u)
			}
			// The peak is the largest value of the profile.
			most := 0.0
			for n := 0; n <= 10000; n++ {
				most = math.Max(most, b.exact(brH*float64(n)/10000))
			}
			if most > scale*(1+1e-12) || most < scale*(1-1e-6) {
				t.Errorf("largest sampled U %g, peak %g", most, scale)
			}
		})
	}
}

// TestDragBalanceExact checks the laminar bed layer: ν U″ = q U² − Π,
// U(0) = 0 and U → U∞ = √(Π/q) (derived).
func TestDragBalanceExact(t *testing.T) {
	q, uInf := dbBalance()
	l := math.Sqrt(2 * dbNu / (q * uInf))
	if u := dbExact(0); math.Abs(u) > 1e-15*uInf {
		t.Errorf("U(0) = %g", u)
	}
	if u := dbExact(40 * l); math.Abs(u/uInf-1) > 1e-15 {
		t.Errorf("U(40 L)/U∞ = %.17g", u/uInf)
	}
	d := 1e-3 * l
	for _, zl := range []float64{0.1, 0.5, 1, 2, 4} {
		z := zl * l
		d2 := (dbExact(z+d) - 2*dbExact(z) + dbExact(z-d)) / (d * d)
		u := dbExact(z)
		if res := (dbNu*d2 - q*u*u + dbGradient) / dbGradient; math.Abs(res) > 1e-5 {
			t.Errorf("z = %g L: residual %.3g of Π", zl, res)
		}
	}
	// The tail: 1 − U/U∞ ≈ 12(5 − 2√6) e^(−2z/L).
	if got, want := 1-dbExact(8*l)/uInf, 12*(5-2*math.Sqrt(6))*math.Exp(-16); math.Abs(got/want-1) > 1e-5 {
		t.Errorf("tail 1 − U/U∞ = %g at z = 8 L, want %g", got, want)
	}
	// The interior sits several drag lengths up, where the layer has died.
	if u := dbExact(dbInterior); math.Abs(u/uInf-1) > 1e-15 {
		t.Errorf("U at the interior's lower edge is %.17g U∞", u/uInf)
	}
}

// TestKHBase: the body force −ν L U is the discrete form of −ν U″ =
// 2ν U0 tanh(ζ) sech²(ζ)/δ², ζ = (z − H/2)/δ, second order in Δz (derived).
func TestKHBase(t *testing.T) {
	var errs []float64
	for _, nz := range []int{128, 256} {
		g, err := solver.NewGrid(8, nz, 1, khH, khCluster(3))
		if err != nil {
			t.Fatal(err)
		}
		_, f := khBase(g)
		worst := 0.0
		for k, z := range g.Zc {
			th := math.Tanh((z - khH/2) / khDelta)
			want := 2 * khNu * khU0 * th * (1 - th*th) / (khDelta * khDelta)
			worst = math.Max(worst, math.Abs(f[k]-want))
		}
		errs = append(errs, worst/(khNu*khU0/(khDelta*khDelta)))
	}
	if errs[1] > 1e-2 {
		t.Errorf("force off by %g of ν U0/δ² at Nz = 256", errs[1])
	}
	if p := order(errs[0], errs[1], 2); math.Abs(p-2) > 0.2 {
		t.Errorf("order %g, want 2", p)
	}
}

// TestRowModes: a wave w = A cos(k_m (x − c t)) sampled along x gives mode
// m the energy (A/2)² and the phase speed c (derived).
func TestRowModes(t *testing.T) {
	g, err := solver.NewGrid(64, 4, 4, 1, solver.Cluster{})
	if err != nil {
		t.Fatal(err)
	}
	const m, amp, c, dt = 3, 0.02, 0.13, 0.2
	k := g.Wavenumber(m)
	r := newRowModes(g, dt)
	row := make([]float64, g.Nx)
	for n := range 50 {
		for i, x := range g.X {
			row[i] = amp * math.Cos(k*(x-c*float64(n)*dt))
		}
		r.add(row)
	}
	energy, speed := r.result()
	if math.Abs(energy[m]/(amp*amp/4)-1) > 1e-12 {
		t.Errorf("energy %g, want %g", energy[m], amp*amp/4)
	}
	if math.Abs(speed[m]/c-1) > 1e-12 {
		t.Errorf("speed %g, want %g", speed[m], c)
	}
	for mm := range energy {
		if mm != m && energy[mm] > 1e-28 {
			t.Errorf("mode %d has energy %g", mm, energy[mm])
		}
	}
}
