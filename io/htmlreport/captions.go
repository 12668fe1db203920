package htmlreport

// caption says what a figure of a run folder shows and how to read it;
// figures are known by their file names in runfolder.FiguresDir.
var captions = map[string]string{
	"vorticity.png": "The spanwise vorticity ω = ∂u/∂z − ∂w/∂x over the slice at the last snapshot, with the canopy outline. " +
		"Red is clockwise rotation (faster water above slower, as in the shear layer at the canopy top), blue anticlockwise. " +
		"The rollers of the canopy-top shear layer show as red blobs strung along the canopy top; how far their colour reaches into the canopy shows how deep they mix. " +
		"The colours end at the 99th percentile of |ω|, and heights may be drawn stretched: the title says by how much.",
	"profiles.png": "The time-mean profiles after the spin-up against height: the mean velocity U, the shear stress (resolved and subgrid) and the turbulent kinetic energy. " +
		"The canopy top and the measured penetration depth δe (where the stress has fallen to 10 % of its peak) are marked, with the published h − 0.23/(C_D a) where it applies. " +
		"The bend of U at the canopy top is the inflection that makes the rollers; the deeper the stress reaches, the better the canopy water is flushed.",
	"spectrum.png": "The spectrum of the vertical velocity w at the probes along the canopy top (Welch's method, after the spin-up), against frequency. " +
		"The peak is the rate at which rollers pass a point; summary.json gives it as flow.roller_frequency_hz when the run was long enough to resolve it, and null with the reason when not.",
	"timeseries.png": "The bulk (depth-mean) velocity and the mean pressure gradient against time. " +
		"Both should level off before the spin-up time ends; a trend after it means the statistics were gathered while the flow was still changing (the run then warns).",
	"uptake.png": "The uptake by the canopy elements per unit of their surface area against height, for each scalar: where on the elements the uptake happens. " +
		"More uptake near the top means the faster water there renews the boundary layer around the elements.",
	"scalars.png": "The time-mean concentration of each scalar against height, with the canopy top. " +
		"The drop from the water above into the canopy is what the uptake takes out faster than the rollers bring in.",
	"rollers.gif": "An animation of the snapshots from the first on (vorticity unless the report was asked for another field): " +
		"watch the shear layer at the canopy top roll up into rollers that grow, pair and sweep into the canopy.",
	// Overlay figures of a comparison.
	"spectra.png": "The spectra of w at each run's probes, overlaid, with each run's peak marked: a shift of the peak is a change of the roller frequency.",
}

// captionFor returns the caption of the figure name, or what it is when
// the name is not a known figure.
func captionFor(name string, comparison bool) string {
	if comparison {
		switch name {
		case "profiles.png":
			return "The mean velocity profiles of the runs, overlaid in the runs' colours: where they part, the canopies slow the water differently."
		case "scalars.png":
			return "The mean concentration profiles of the runs' scalars, overlaid: a lower curve inside the canopy is water that the canopy depletes more."
		case "uptake.png":
			return "The element uptake by height of the runs, overlaid: which canopy takes up more, and at which height."
		}
	}
	if c, ok := captions[name]; ok {
		return c
	}
	return "The figure " + name + " of the figures folder."
}
