package report

// VorticityFigureSize returns the pixel size that vorticity.png of the run
// folder dir should have, for the tests of package report_test.
func VorticityFigureSize(dir string) (w, h int, err error) {
	r, err := loadRun(dir)
	if err != nil {
		return 0, 0, err
	}
	s, err := loadSlice(r)
	if err != nil {
		return 0, 0, err
	}
	p, err := lastPicture(r, s)
	if err != nil {
		return 0, 0, err
	}
	return p.lay.width, p.lay.height, nil
}

// SpectrumPeak returns the peak frequency of the spectrum that
// spectrum.png of the run folder dir shows.
func SpectrumPeak(dir string) (float64, error) {
	r, err := loadRun(dir)
	if err != nil {
		return 0, err
	}
	sp, err := spectrumOf(r)
	return sp.peak, err
}
