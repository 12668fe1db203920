// Package htmlreport writes report.html: one self-contained HTML file
// that holds what a person needs to judge a run (or a comparison of runs)
// without the run folder or a server, so that it can be sent as an e-mail
// attachment or opened from a file manager.
//
// A run's report holds the summary table with units (from the summary
// types of io/runfolder), the warnings, the figures and the animation of
// the figures folder embedded as data URIs, each with a caption that says
// what it shows and how to read it, the case as run, the program's
// provenance and the cautions on what a 2-D slice can and cannot tell. A
// comparison's report holds the side-by-side table of runfolder.Compare
// and the overlay figures. The file loads nothing from elsewhere: no
// scripts, fonts or styles from the network.
package htmlreport
