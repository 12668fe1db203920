// Package stats keeps running statistics of a solver run: profiles averaged
// over x and over time from a start time, and time series at probe points.
//
// Averages are weighted by the step length, so a run with adaptive steps
// gives time averages, not step averages. Fluctuations are taken about the
// x- and time-mean: ⟨u′w′⟩ = ⟨u w⟩ − ⟨u⟩⟨w⟩, with the product formed at the
// faces where w lives (u interpolated linearly in z). Adding a sample
// allocates nothing.
//
// The analysis of the recorded series lives here too: [Probes.Even] and
// [EvenSeries] resample series taken at adaptive steps onto even times,
// [WelchSpectrum] and [WelchSegment] give their averaged spectrum (segment
// choice included, so a run and its readers cannot differ),
// [QuadrantShares] splits a Reynolds stress by quadrant,
// [CorrelationSpacing] and [CorrelationSpacingRows] give the spacing of
// structures along a row (or along the rows of a plane), and
// [SpanCorrelationLength] how far across a span they stay coherent.
//
// In a slab (Grid.Ny > 1) every average runs over x, y and time, each level
// a plane of Ny·Nx values; the profiles add ⟨v′v′⟩ to the kinetic energy,
// and probes may sit anywhere across the span ([NewProbesAcross]).
//
// [Phases] keeps the same x-averages by phase of a periodic forcing (waves,
// tides): the cycle is cut into equal bins and each step goes into the bin
// of its middle; per bin the velocity profile, the shear stress and each
// scalar's flux about the phase mean, and the uptake by the elements and
// the bed. [Harmonic] takes the first harmonic of a quantity over the bins
// and [LayerMean] the mean of a profile over a layer.
//
// Units: velocities m/s, stresses (per unit mass) m²/s², viscosities m²/s.
package stats
