package solver

import "fmt"

// State is everything a step depends on, for checkpoints: restoring it into
// a solver built from the same Config continues the run bit for bit.
//
// The x-derivatives are kept rather than recomputed because a fresh
// transform of the velocity would differ from the stored one in the last
// bits. The explicit terms of the previous stage are not needed: the first
// stage of a step does not use them (ζ₁ = 0).
type State struct {
	Time     float64 // s
	Steps    int
	LastStep float64 // s
	Gradient float64 // m/s², the mean pressure gradient Π
	Pressure []complex128

	U, W, DUDX, DWDX []float64
	// Three dimensions only (nil in the slice): v, ∂v/∂x and the
	// y-derivatives of u, v and w.
	V, DVDX, DUDY, DVDY, DWDY []float64

	// Per scalar: the concentration and its x-derivative at the centres,
	// the running budget and the element uptake per level.
	Scalars, ScalarDX, UptakeByLevel [][]float64
	ScalarDY                         [][]float64 // three dimensions only
	Budgets                          []ScalarBudget
}

// Save copies the solver's state into st, reusing its slices when they are
// large enough.
func (s *Solver) Save(st *State) {
	st.Time, st.Steps, st.LastStep, st.Gradient = s.t, s.steps, s.dt, s.gradPi
	st.U = append(st.U[:0], s.u...)
	st.W = append(st.W[:0], s.w...)
	st.DUDX = append(st.DUDX[:0], s.ux...)
	st.DWDX = append(st.DWDX[:0], s.wx...)
	st.Pressure = append(st.Pressure[:0], s.phat...)
	for _, f := range s.spanState(st) {
		*f.saved = append((*f.saved)[:0], f.live...)
	}
	n := len(s.sc)
	st.Scalars, st.ScalarDX, st.UptakeByLevel = make([][]float64, n), make([][]float64, n), make([][]float64, n)
	st.Budgets = make([]ScalarBudget, n)
	st.ScalarDY = nil
	if s.ny > 1 {
		st.ScalarDY = make([][]float64, n)
	}
	for i, sc := range s.sc {
		if s.ny > 1 {
			st.ScalarDY[i] = append([]float64(nil), sc.cy...)
		}
		st.Scalars[i] = append([]float64(nil), sc.c...)
		st.ScalarDX[i] = append([]float64(nil), sc.cx...)
		st.UptakeByLevel[i] = append([]float64(nil), sc.byLevel...)
		st.Budgets[i] = sc.budget
	}
}

// Restore sets the solver's state from st, which must come from a solver of
// the same grid.
func (s *Solver) Restore(st *State) error {
	if len(st.U) != len(s.u) || len(st.W) != len(s.w) || len(st.DUDX) != len(s.ux) ||
		len(st.DWDX) != len(s.wx) || len(st.Pressure) != len(s.phat) {
		return fmt.Errorf("solver: the saved state is for another grid (%d centre values, this grid has %d)", len(st.U), len(s.u))
	}
	for _, f := range s.spanState(st) {
		if len(*f.saved) != len(f.live) {
			return fmt.Errorf("solver: the saved state is for another grid (%d values of v or a y-derivative, this grid has %d)", len(*f.saved), len(f.live))
		}
	}
	if len(st.Scalars) != len(s.sc) || len(st.ScalarDX) != len(s.sc) || len(st.Budgets) != len(s.sc) || len(st.UptakeByLevel) != len(s.sc) {
		return fmt.Errorf("solver: the saved state has %d scalars, this run %d", len(st.Scalars), len(s.sc))
	}
	if s.ny > 1 && len(st.ScalarDY) != len(s.sc) {
		return fmt.Errorf("solver: the saved state has no y-derivatives of its %d scalars", len(s.sc))
	}
	for i, sc := range s.sc {
		if len(st.Scalars[i]) != len(sc.c) || len(st.ScalarDX[i]) != len(sc.cx) || len(st.UptakeByLevel[i]) != len(sc.byLevel) ||
			s.ny > 1 && len(st.ScalarDY[i]) != len(sc.cy) {
			return fmt.Errorf("solver: the saved scalar %q is for another grid", sc.cfg.Name)
		}
	}
	for i, sc := range s.sc {
		copy(sc.c, st.Scalars[i])
		copy(sc.cx, st.ScalarDX[i])
		if s.ny > 1 {
			copy(sc.cy, st.ScalarDY[i])
		}
		copy(sc.byLevel, st.UptakeByLevel[i])
		sc.budget = st.Budgets[i]
	}
	s.t, s.steps, s.dt, s.gradPi = st.Time, st.Steps, st.LastStep, st.Gradient
	s.rateFresh = false
	copy(s.u, st.U)
	copy(s.w, st.W)
	copy(s.ux, st.DUDX)
	copy(s.wx, st.DWDX)
	copy(s.phat, st.Pressure)
	for _, f := range s.spanState(st) {
		copy(f.live, *f.saved)
	}
	s.pressureGradientRows(0, s.pgrad.Rows())
	for p := 0; p < s.crew.n; p++ {
		s.pgrad.InversePart(p)
	}
	return nil
}

// stateField pairs a field of the solver with its copy in a State.
type stateField struct {
	live  []float64
	saved *[]float64
}

// spanState lists the three-dimensional fields of the state (none in the
// slice).
func (s *Solver) spanState(st *State) []stateField {
	if s.ny == 1 {
		return nil
	}
	return []stateField{{s.v, &st.V}, {s.vx, &st.DVDX}, {s.uy, &st.DUDY}, {s.vy, &st.DVDY}, {s.wy, &st.DWDY}}
}
