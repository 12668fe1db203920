package casefile

// Output is the [output] table.
type Output struct {
	// ProfileEvery is the simulated time in s between rows of mean
	// profiles written, > 0 and at most Time.Duration; default
	// Time.Duration/100.
	ProfileEvery float64 `toml:"profile_every"`
}

func checkOutput(c *Case, p *problems) {
	o := &c.Output
	dur := c.Time.Duration
	durOK := p.ok("time.duration") && dur > 0 && finite(dur)
	if p.parsing && !p.has("output.profile_every") {
		o.ProfileEvery = dur / 100
		p.derive("output.profile_every", "time.duration")
	}
	if !p.ok("output.profile_every") || !p.positive("output.profile_every", o.ProfileEvery, "simulated time between mean-profile rows, s", "") {
		return
	}
	if durOK && o.ProfileEvery > dur {
		p.addf("output.profile_every", fmtFloat(o.ProfileEvery), "must not exceed time.duration = %s s, or no profile would be written; e.g. profile_every = %s", fmtFloat(dur), fmtFloat(dur/100))
	}
}

func outputTemplate() string {
	return `[output]
# Simulated time between rows of mean profiles written, s.
# Default duration/100; > 0 and at most duration.
# profile_every = 6.0
`
}
