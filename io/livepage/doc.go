// Package livepage serves the live page of a run: a web page that shows a
// running (or finished) simulation as it goes, for a class on a projector
// or a person at a desk.
//
// # What the page shows
//
// The spanwise vorticity of the slice (and one scalar's concentration when
// the run has scalars) painted as vorticity.png paints it, with the canopy
// outline and a colour bar; the simulated time, the progress and the
// estimated wall time left; the x-mean velocity profile with the canopy
// top; the main metrics of summary.json (penetration depth, roller
// frequency and spacing, uptake) with their history as they converge; and
// the run's warnings. A View holds one state of all that; Metrics picks
// the metrics from the summary types of io/runfolder.
//
// # How it is served
//
// Listen binds the one address it is given, a loopback address unless
// the caller allows others explicitly (ErrRemote otherwise), and says in
// plain words when the address is in use or the port needs privileges.
// Server.Publish hands a View to the server and returns at once: the run
// never waits for the page. The server's own goroutine records the
// metrics of every View for their histories and, while a page follows,
// turns the newest View into one message (the pictures as PNG data URIs,
// two pixels a grid point) and pushes it to every open page with
// server-sent events; after each drawing it rests fifty times as long as
// the drawing took, so that it takes about 2 % of a core at most,
// however busy the machine. A page that falls behind gets the newest
// message only, and a page that connects or reconnects gets the newest
// message at once. The page, its script and its style are embedded (no
// external scripts, fonts or styles; a Content-Security-Policy allows
// nothing else), and requests for another host name than the bound
// loopback address are refused, so that other web sites cannot read the
// page through a renamed host (DNS rebinding). Files of the run folder
// (figures, report.html) are served read-only under /files/ through an
// os.Root, which refuses every path that leads outside the folder.
//
// Follow makes Views from the files of a run folder, for a run that runs
// elsewhere or has finished: the newest snapshot of fields.h5 (through
// io/h5), the summary and its metrics (through io/runfolder), the
// warnings of run.log.
//
// Units are SI throughout: times in s, lengths in m, velocities in m/s.
package livepage
