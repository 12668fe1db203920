package stats

import (
	"errors"
	"fmt"

	"github.com/mjibson/go-dsp/spectral"
)

// Spectrum is a one-sided power spectral density.
type Spectrum struct {
	Freq []float64 // Hz
	PSD  []float64 // (unit of the signal)²/Hz
}

// MinSpectrumSamples is the shortest evenly sampled series that a run
// takes a spectrum of (common practice, no source: a few segments of at
// least 64 samples).
const MinSpectrumSamples = 64

// WelchSegment returns the samples per Welch segment for series of n
// samples: the largest power of two no longer than n/2 (so that three to
// seven half-overlapping segments are averaged), but at least
// MinSpectrumSamples. A run sees few roller passages after its spin-up, so
// the segments are as long as a few averages allow: a segment must hold
// several periods for the peak to rise above the lowest frequency bin
// (common practice, no source).
func WelchSegment(n int) int {
	seg := 1
	for seg*2 <= n/2 {
		seg *= 2
	}
	return max(seg, MinSpectrumSamples)
}

// WelchSpectrum averages the Welch power spectra (Hann window, half
// overlapping segments of segment samples) of evenly sampled series taken
// every dt seconds. Each series has its mean removed first.
func WelchSpectrum(series [][]float64, dt float64, segment int) (Spectrum, error) {
	if len(series) == 0 || !(dt > 0) {
		return Spectrum{}, errors.New("stats: a spectrum needs at least one series and a sampling interval > 0")
	}
	segment -= segment % 2
	if segment < 8 {
		return Spectrum{}, errors.New("stats: a Welch segment needs at least 8 samples")
	}
	var out Spectrum
	for _, s := range series {
		if len(s) < segment {
			return Spectrum{}, errors.New("stats: a series is shorter than one Welch segment; run longer or sample more often")
		}
		mean := 0.0
		for _, v := range s {
			mean += v
		}
		mean /= float64(len(s))
		x := make([]float64, len(s))
		for i, v := range s {
			x[i] = v - mean
		}
		p, f := spectral.Pwelch(x, 1/dt, &spectral.PwelchOptions{NFFT: segment, Noverlap: segment / 2})
		if out.PSD == nil {
			out.PSD = make([]float64, len(p))
			out.Freq = f
		}
		for i := range p {
			out.PSD[i] += p[i] / float64(len(series))
		}
	}
	return out, nil
}

// ResolvedPeak returns Peak when the spectrum resolves it, else 0 and why,
// in words. A peak is resolved when the largest density lies neither in
// the lowest positive frequency bin (one period per segment: the peak may
// lie lower still, and its period is as long as the segment) nor in the
// highest (the Nyquist frequency of the sampling); common practice, no
// source.
func (s Spectrum) ResolvedPeak() (float64, string) {
	n := len(s.PSD)
	if n < 3 || len(s.Freq) != n {
		return 0, "the spectrum has too few frequencies"
	}
	at := 1
	for i := 2; i < n; i++ {
		if s.PSD[i] > s.PSD[at] {
			at = i
		}
	}
	switch {
	case !(s.PSD[at] > 0):
		return 0, "the spectrum is zero: the flow at the probes is steady"
	case at == 1:
		return 0, fmt.Sprintf("the spectrum peaks at its lowest resolved frequency, %.3g Hz (one period per Welch segment of %.3g s): the rollers' period may be as long as the series allows; run longer after the spin-up", s.Freq[1], 1/s.Freq[1])
	case at == n-1:
		return 0, fmt.Sprintf("the spectrum peaks at the Nyquist frequency %.3g Hz of the probe sampling: not a roller frequency", s.Freq[n-1])
	}
	return s.Peak(), ""
}

// Peak returns the frequency of the largest spectral density above f = 0,
// refined by a parabola through the peak bin and its neighbours.
func (s Spectrum) Peak() float64 {
	best, at := -1.0, -1
	for i := 1; i < len(s.PSD); i++ {
		if s.PSD[i] > best {
			best, at = s.PSD[i], i
		}
	}
	if at <= 0 {
		return 0
	}
	if at < len(s.PSD)-1 {
		a, b, c := s.PSD[at-1], s.PSD[at], s.PSD[at+1]
		if d := a - 2*b + c; d < 0 {
			off := 0.5 * (a - c) / d
			return s.Freq[at] + off*(s.Freq[at+1]-s.Freq[at])
		}
	}
	return s.Freq[at]
}
