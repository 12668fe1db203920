// Package report draws the figures of a run folder. It reads the folder
// through package io/runfolder (the summary and the tables) and the fields
// through package io/h5, and writes each figure atomically.
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
package report
