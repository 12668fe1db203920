package stats

import "fmt"

// Export returns the accumulators as named arrays, for checkpoints. The
// slices are copies.
func (p *Profiles) Export() map[string][]float64 {
	c := func(s []float64) []float64 { return append([]float64(nil), s...) }
	m := map[string][]float64{
		"stats_u": c(p.su), "stats_uu": c(p.suu), "stats_nut": c(p.snut),
		"stats_w": c(p.sw), "stats_ww": c(p.sww), "stats_uf": c(p.suf),
		"stats_uw": c(p.suw), "stats_sgs": c(p.ssgs),
		"stats_tuf": c(p.tuf), "stats_tw": c(p.tw),
		"stats_weight": {p.weight, float64(p.n), p.Start},
	}
	if p.sv != nil {
		m["stats_v"], m["stats_vv"] = c(p.sv), c(p.svv)
	}
	return m
}

// Import restores accumulators saved by Export on the same grid.
func (p *Profiles) Import(m map[string][]float64) error {
	dst := map[string][]float64{
		"stats_u": p.su, "stats_uu": p.suu, "stats_nut": p.snut,
		"stats_w": p.sw, "stats_ww": p.sww, "stats_uf": p.suf,
		"stats_uw": p.suw, "stats_sgs": p.ssgs,
		"stats_tuf": p.tuf, "stats_tw": p.tw,
	}
	if p.sv != nil {
		dst["stats_v"], dst["stats_vv"] = p.sv, p.svv
	}
	for name, d := range dst {
		v, ok := m[name]
		if !ok || len(v) != len(d) {
			return fmt.Errorf("stats: saved statistics lack %s or are for another grid", name)
		}
		copy(d, v)
	}
	w := m["stats_weight"]
	if len(w) != 3 {
		return fmt.Errorf("stats: saved statistics lack their weight")
	}
	p.weight, p.n, p.Start = w[0], int(w[1]), w[2]
	return nil
}

// Export returns the recorded series as named arrays, for checkpoints.
func (p *Probes) Export() map[string][]float64 {
	m := map[string][]float64{"probe_t": append([]float64(nil), p.T...)}
	for n := range p.Points {
		m[fmt.Sprintf("probe_u_%d", n)] = append([]float64(nil), p.U[n]...)
		m[fmt.Sprintf("probe_w_%d", n)] = append([]float64(nil), p.W[n]...)
	}
	return m
}

// Import restores series saved by Export for the same probes.
func (p *Probes) Import(m map[string][]float64) error {
	t, ok := m["probe_t"]
	if !ok {
		return fmt.Errorf("stats: saved probes lack their times")
	}
	p.T = append(p.T[:0], t...)
	for n := range p.Points {
		u, okU := m[fmt.Sprintf("probe_u_%d", n)]
		w, okW := m[fmt.Sprintf("probe_w_%d", n)]
		if !okU || !okW || len(u) != len(t) || len(w) != len(t) {
			return fmt.Errorf("stats: saved probes do not match probe %d", n)
		}
		p.U[n] = append(p.U[n][:0], u...)
		p.W[n] = append(p.W[n][:0], w...)
	}
	return nil
}
