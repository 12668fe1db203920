// Package transform computes batched real-to-complex Fourier transforms of
// whole fields along the periodic x direction.
//
// A field is stored row by row: row r (one z level) holds N real samples
// x_j, j = 0..N-1, at Real()[r*N : (r+1)*N]. Its spectrum holds N/2+1 complex
// coefficients per row at Spec()[r*(N/2+1) : (r+1)*(N/2+1)].
//
// Conventions, the same for every backend:
//
//	Forward:  c_k = (1/N) Σ_j x_j exp(−2πi jk/N),  k = 0..N/2
//	Inverse:  x_j = Σ_k c_k exp(+2πi jk/N) over all k in −N/2..N/2−1,
//	          with c_(−k) = conj(c_k)
//
// so that a row x_j = A cos(2π m j/N) has c_m = A/2, and Inverse(Forward(x))
// returns x. The imaginary parts of c_0 and c_(N/2) are ignored by Inverse.
// Inverse may overwrite the spectrum buffer (FFTW's complex-to-real
// transforms destroy their input). Forward leaves the physical buffer as it
// was. Both buffers start zeroed.
//
// With this scaling a row's mean is c_0, and Parseval's identity reads
//
//	(1/N) Σ_j x_j² = |c_0|² + 2 Σ_(0<k<N/2) |c_k|² + |c_(N/2)|²
//
// A row A cos(2π m j/N) + B sin(2π m j/N) + C with 0 < m < N/2 has
// c_0 = C, c_m = (A − iB)/2 and every other c_k = 0; with m = N/2 (the
// Nyquist mode, where the sine vanishes at the samples) it has c_0 = C and
// c_(N/2) = A.
//
// # Planes
//
// NewPlanes makes plans of two-dimensional transforms over x and y: plane r
// holds Ny rows of N samples, x_(j,l) at Real()[(r·Ny + l)·N + j], and its
// spectrum Ny rows of N/2+1 coefficients, c_(k,l) at
// Spec()[(r·Ny + l)·(N/2+1) + k], l = 0..Ny−1 standing for the wavenumber
// index l below Ny/2 and l − Ny from Ny/2 on. The conventions carry over:
//
//	Forward:  c_(k,l) = (1/(N Ny)) Σ_(j,m) x_(j,m) exp(−2πi (jk/N + ml/Ny))
//	Inverse:  x_(j,m) = Σ_(k,l) c_(k,l) exp(+2πi (jk/N + ml/Ny)),
//	          with c_(−k,−l) = conj(c_(k,l))
//
// The columns k = 0 and k = N/2 store both c_(k,l) and c_(k,−l); Inverse
// first sets the upper half of each from the lower half (c_(k,Ny−l) ←
// conj(c_(k,l)), the imaginary parts of the self-conjugate ones zeroed), so
// every backend transforms the same Hermitian spectrum.
//
// Two backends implement Plan: FFTW 3 through cgo (the default; plans are
// made once, and the buffers live in C memory so that FFTW may use its
// aligned SIMD kernels) and gonum's dsp/fourier (pure Go; the reference the
// tests hold FFTW against; for planes it composes its one-dimensional real
// and complex transforms). A plan's rows are split into contiguous parts
// that may be transformed concurrently by different goroutines; Forward and
// Inverse transform the parts one after another with the same per-part
// machinery, so they give bit for bit what the part calls give. No
// transform call allocates Go memory.
//
// The FFTW backend plans with FFTW_MEASURE, once, in New: the results are
// fixed for a plan's life but their last bits may differ between plans made
// in different runs. Calls other than the transforms (New, Close) serialise
// on a package lock because FFTW's planner is not thread-safe.
package transform
