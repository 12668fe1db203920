// Package report writes the analysis files of a run folder: summary.json,
// CSV tables of profiles and time series, and the figures. Files are
// written atomically (temporary file, fsync, rename), so a reader never sees
// half a file and an interrupted write leaves the previous version in place.
//
// # Figures
//
// WriteFigures (and Figures) draws, from what a run folder holds, the PNG
// figures and the animation of RUNDIR/figures: the vorticity of the last
// snapshot with the canopy outline (vorticity.png), the time-mean profiles
// with the canopy top and the penetration depth (profiles.png), the
// spectrum of w at the canopy-top probes (spectrum.png), the bulk velocity
// and pressure gradient against time (timeseries.png), and the rollers as an
// animated GIF (rollers.gif). A figure whose data the folder lacks is left
// out with a Note. CompareFigures overlays the profiles and spectra of
// several runs.
//
// Colour maps use the project's own diverging palette (DivergingColor):
// navy-teal for negative values through a pale sand at zero to oxblood for
// positive ones, interpolated in CIE L*a*b*. Overlay figures give each run
// its colour from RunColour. Axis labels carry SI units in brackets.
//
// # Reading summaries
//
// ReadSummary flattens summary.json into dotted keys ("flow.u_top_m_s",
// "scalars.oxygen.total_uptake_per_bed_area"); Unit reads the unit from a
// key's suffix. Compare lines the numeric keys of several runs up side by
// side, with each value's ratio to the first run's.
package report
