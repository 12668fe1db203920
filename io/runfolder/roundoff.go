package runfolder

import (
	"math"
	"strings"
)

// RoundOff is the relative size below which a compared value counts as
// round-off: a value whose magnitude is at most RoundOff times the scale
// of its quantity is zero up to the arithmetic, and no ratio is taken to
// it. The scale of a quantity is the largest magnitude of its values in
// all the compared runs, where the values of one quantity are those of
// one key, except that the uptake budget terms of a scalar (the keys of
// scalars.NAME ending in "_per_bed_area") share one scale, and so do its
// mean concentrations (the keys of scalars.NAME starting with "mean_").
// Keys that measure round-off themselves (flow.max_divergence and the
// budget_relative_imbalance of each scalar) get no ratio at all.
const RoundOff = 1e-9

// quantity names the scale a key's values are measured against (see
// RoundOff).
func quantity(key string) string {
	if !strings.HasPrefix(key, "scalars.") {
		return key
	}
	i := strings.LastIndexByte(key, '.')
	section, name := key[:i+1], key[i+1:]
	switch {
	case strings.HasSuffix(name, "_per_bed_area"):
		return section + "*_per_bed_area"
	case strings.HasPrefix(name, "mean_"):
		return section + "mean_*"
	}
	return key
}

// measuresRoundOff tells the keys whose values are round-off by design.
func measuresRoundOff(key string) bool {
	return key == "flow.max_divergence" || strings.HasSuffix(key, ".budget_relative_imbalance")
}

// quantityScales returns the scale of each quantity of the rows: the
// largest magnitude of its values.
func quantityScales(rows []ComparisonRow) map[string]float64 {
	scales := map[string]float64{}
	for _, r := range rows {
		q := quantity(r.Key)
		for _, v := range r.Values {
			if v != nil {
				scales[q] = math.Max(scales[q], math.Abs(*v))
			}
		}
	}
	return scales
}

// ratios fills the RatioToFirst of every row: each value over the first
// run's, nil where either is missing, where the first is round-off (see
// RoundOff) or zero, and for keys that measure round-off.
func ratios(rows []ComparisonRow) {
	scales := quantityScales(rows)
	for n := range rows {
		r := &rows[n]
		first := r.Values[0]
		ok := first != nil && !measuresRoundOff(r.Key) && math.Abs(*first) > RoundOff*scales[quantity(r.Key)]
		r.RatioToFirst = make([]*float64, len(r.Values))
		for i, v := range r.Values {
			if ok && v != nil {
				q := *v / *first
				r.RatioToFirst[i] = &q
			}
		}
	}
}
