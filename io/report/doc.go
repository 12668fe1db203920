// Package report draws the figures of a run folder. It reads the folder
// through package io/runfolder (the summary and the tables) and the fields
// through package io/h5, and writes each figure atomically.
//
// # Figures
//
// WriteFigures (and Figures, and WriteFiguresWith for Options) draws, from
// what a run folder holds, the PNG figures and the animation of
// RUNDIR/figures: the vorticity of the last snapshot with the canopy
// outline (vorticity.png), the time-mean profiles with the canopy top and
// the penetration depth (profiles.png), the spectrum of w at the probes,
// labelled with their height (spectrum.png), the bulk velocity and
// pressure gradient against time, and the bent height of flexible blades
// (timeseries.png), the element uptake by height (uptake.png), the
// time-mean concentration profile of each scalar (scalars.png), the
// velocity and stress profiles by phase of a forcing with waves or tides
// (phases.png), and an animation (rollers.gif) of the vorticity, or of
// another field of the snapshots such as a dye (Options.Animate), from the
// first snapshot on so that the roll-up shows. With flexible blades the
// canopy outline of the maps follows the bent height of the time series at
// each snapshot's time. A figure whose data the
// folder lacks (a folder written before the figure existed, an
// interrupted run) is left out with a Note. CompareFigures overlays the
// velocity profiles, spectra (peaks marked), scalar concentration profiles
// and uptake by height of several runs.
//
// Figure text follows one style: sans-serif fonts, plain tick labels
// ("20", not "2e+01"), titles broken into lines that fit, and keys in a
// strip of their own above the plots, where they cover neither data nor
// frames. NewPlot, LogAxis and WritePlot give other packages' figures
// (the sweep plots) the same style.
//
// Colour maps use the project's own diverging palette (DivergingColor):
// navy-teal for negative values through a pale sand at zero to oxblood for
// positive ones, interpolated in CIE L*a*b*. Overlay figures give each run
// its colour from RunColour. Axis labels carry SI units in brackets.
package report
