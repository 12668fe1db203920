package validation

import (
	"fmt"
	"os"
	"testing"
	"time"

	"math"
	"rollerbed/solver"
	"rollerbed/solver/transform"
	"rollerbed/validation/stability"
)

func TestScratchTS(t *testing.T) {
	if os.Getenv("SCRATCH") != "ts" {
		t.Skip()
	}
	mode, _ := stability.LeastStable(stability.Poiseuille(), tsAlpha, tsRe, tsChebyshev)
	want := 2 * tsAlpha * tsCi
	for _, r := range []tsRun{{"clustered", 256, 0.01}, {"clustered", 256, 0.05}, {"clustered", 256, 0.1}, {"clustered", 256, 0.2}, {"uniform", 256, 0.05}, {"uniform", 512, 0.05}, {"uniform", 256, 0.1}, {"uniform", 512, 0.1}} {
		st := time.Now()
		res, err := r.measure(Options{Backend: transform.FFTW}, mode)
		if err != nil {
			t.Fatal(err)
		}
		fmt.Printf("%v: rate err %.5f early-late %.5f cr err %.2e  (%v)\n", r, res.rate/want-1, (res.early-res.late)/res.rate, res.cr/tsCr-1, time.Since(st))
	}
}

func TestScratchCase(t *testing.T) {
	name := os.Getenv("CASE")
	if name == "" {
		t.Skip()
	}
	st := time.Now()
	checks, err := Run([]string{name}, Options{Backend: transform.FFTW, Full: os.Getenv("FULL") != "", Keep: os.Getenv("KEEP")})
	for _, c := range checks {
		fmt.Println(c)
	}
	fmt.Println(time.Since(st))
	if err != nil {
		t.Fatal(err)
	}
}

func TestScratchDB(t *testing.T) {
	if os.Getenv("SCRATCH") != "db" {
		t.Skip()
	}
	q, uInf := dbBalance()
	for _, nz := range []int{64, 128, 256, 512} {
		g, _ := solver.NewGrid(8, nz, dbLx, dbH, dbCluster())
		est := 0.0
		est2 := 0.0
		for k, z := range g.Zc {
			u := dbExact(z)
			du := math.Sqrt(2*q/(3*dbNu)) * (uInf - u) * math.Sqrt(u+2*uInf)
			d2 := (q*u*u - dbGradient) / dbNu
			d3 := 2 * q * u * du / dbNu
			d4 := 2 * q * (du*du + u*d2) / dbNu
			hi, lo := g.Hf[k], g.Hf[k]
			if k+1 < nz {
				hi = g.Hf[k+1]
			}
			_ = lo
			tau := dbNu * math.Abs(g.Dz[k]*g.Dz[k]*d4/12)
			tau2 := dbNu * math.Abs((hi-g.Hf[k])*d3/3)
			est = math.Max(est, tau/(2*q*uInf)/uInf)
			est2 = math.Max(est2, (tau+tau2)/(2*q*uInf)/uInf)
		}
		fmt.Println(nz, est, est2)
	}
}

func envF(name string, def float64) float64 {
	if v := os.Getenv(name); v != "" {
		var f float64
		fmt.Sscan(v, &f)
		return f
	}
	return def
}

func TestScratchCS(t *testing.T) {
	if os.Getenv("SCRATCH") != "cs" {
		t.Skip()
	}
	c := csConfig(Options{})
	c.nx = int(envF("NX", float64(c.nx)))
	c.nz = int(envF("NZ", float64(c.nz)))
	c.lx = envF("LX", c.lx)
	c.spinUp = envF("SPIN", c.spinUp)
	c.average = envF("AVG", c.average)
	c.sample = envF("SAMPLE", c.sample)
	c.segment = int(envF("SEG", float64(c.segment)))
	c.cluster.AtFactor = envF("CLF", c.cluster.AtFactor)
	c.cluster.AtWidth = envF("CLW", c.cluster.AtWidth)
	c.seed = uint64(envF("SEED", 1))
	c.bulk = envF("BULK", c.bulk)
	c.smagorin = envF("CS", c.smagorin)
	c.cfl = envF("CFL", c.cfl)
	st := time.Now()
	m, err := c.run(Options{Backend: transform.FFTW, Workers: int(envF("W", 1))})
	if err != nil {
		t.Fatal(err)
	}
	l := m.layer
	fmt.Printf("%dx%d Lx=%g spin=%g avg=%g: %v, %d steps, maxCFL %.3f\n", c.nx, c.nz, c.lx, c.spinUp, c.average, time.Since(st).Round(time.Millisecond), m.steps, m.maxCFL)
	fmt.Printf("  Uh=%.4f U1=%.4f U2=%.4f (z2=%.3f) Ubar=%.4f theta=%.4f dw=%.4f Ls=%.4f Pi=%.3g\n", l.UTop, l.U1, l.U2, l.Z2, l.UBar, l.Theta, l.VorticityThickness, l.ShearLength, m.gradient)
	fmt.Printf("  deltaE*CDa=%.4f (0.23)  f=%.4f Hz  Ubar/f/Ls=%.3f Uh/f/Ls=%.3f (8.1)  f theta/Ubar=%.4f (0.032)\n", m.delta*csCD*csA, m.freq, l.UBar/m.freq/l.ShearLength, l.UTop/m.freq/l.ShearLength, m.freq*l.Theta/l.UBar)
	best := 1
	for k := range m.modes {
		if m.modes[k] > m.modes[best] {
			best = k
		}
	}
	fmt.Printf("  dominant x-mode m=%d Lambda=%.3f m (=%.2f Ls), speed %.4f m/s (%.2f Uh); Lambda/Ls from c/f = %.2f\n", best, c.lx/float64(best), c.lx/float64(best)/l.ShearLength, m.speed[best], m.speed[best]/l.UTop, m.speed[best]/m.freq/l.ShearLength)
	for k := 1; k < min(12, len(m.modes)); k++ {
		fmt.Printf("    m=%d E=%.3g c=%.4f\n", k, m.modes[k], m.speed[k])
	}
}
