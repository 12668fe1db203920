package casefile

import "rollerbed/io/stricttoml"

// Time is the [time] table: how long to run and how to step.
type Time struct {
	// Duration is the simulated time to run in s, > 0. Required.
	Duration float64 `toml:"duration"`
	// SpinUp is the simulated time in s after which statistics start:
	// the running statistics (time means, spectra, ...) leave out the first
	// SpinUp seconds, in which the flow develops from its initial state.
	// 0 <= SpinUp < Duration; default 0.
	SpinUp float64 `toml:"spin_up"`
	// CFL is the target advective Courant number of the adaptive step,
	// 0 < CFL <= 1.5; default 0.5.
	CFL float64 `toml:"cfl"`
	// MaxStep is an upper bound on the adaptive step in s, >= 0; 0 (the
	// default) is no bound.
	MaxStep float64 `toml:"max_step"`
	// FixedStep, when > 0, is a fixed step in s that replaces the adaptive
	// one, at most Duration; 0 (the default) is adaptive.
	FixedStep float64 `toml:"fixed_step"`
}

// Limits and defaults of the step. The low-storage three-stage Runge–Kutta
// scheme is stable for advection up to a Courant number of √3 ≈ 1.7
// (common practice, no source); 1.5 leaves a margin, and the default of
// half that leaves room for the flow to speed up within a step.
const (
	maxCFL     = 1.5
	defaultCFL = 0.5
)

func checkTime(c *Case, p *stricttoml.Problems) {
	t := &c.Time
	p.Require("time.duration", "the simulated time to run in s, > 0", "duration = 60.0")
	if p.Parsing && !p.Has("time.cfl") {
		t.CFL = defaultCFL
	}
	if p.OK("time.duration") {
		p.Positive("time.duration", t.Duration, "simulated time to run, s", "e.g. duration = 60.0")
	}
	if p.OK("time.spin_up") && p.AtLeast("time.spin_up", t.SpinUp, 0, "simulated time after which statistics start, s", "0 starts them at once") &&
		p.OK("time.duration") && t.Duration > 0 && stricttoml.Finite(t.Duration) && t.SpinUp >= t.Duration {
		p.Addf("time.spin_up", stricttoml.FormatFloat(t.SpinUp), "must be less than time.duration = %s s, or no statistics would be gathered; e.g. spin_up = %s", stricttoml.FormatFloat(t.Duration), stricttoml.FormatRound(t.Duration/4))
	}
	if p.OK("time.cfl") && !(t.CFL > 0 && t.CFL <= maxCFL) {
		p.Add("time.cfl", stricttoml.FormatFloat(t.CFL), "must be > 0 and <= 1.5 (target advective Courant number; the time scheme is unstable above about 1.7); e.g. cfl = 0.5")
	}
	if p.OK("time.max_step") {
		p.AtLeast("time.max_step", t.MaxStep, 0, "upper bound on the adaptive step, s; 0 = none", "")
	}
	if p.OK("time.fixed_step") && p.AtLeast("time.fixed_step", t.FixedStep, 0, "fixed step, s; 0 = adaptive", "") && t.FixedStep > 0 {
		if p.OK("time.duration") && t.Duration > 0 && t.FixedStep > t.Duration {
			p.Addf("time.fixed_step", stricttoml.FormatFloat(t.FixedStep), "must not exceed time.duration = %s s; use a smaller step", stricttoml.FormatFloat(t.Duration))
		}
		if p.OK("time.max_step") && t.MaxStep > 0 {
			p.Add("time.max_step", stricttoml.FormatFloat(t.MaxStep), "bounds the adaptive step and has no use with time.fixed_step; remove one of time.max_step and time.fixed_step")
		}
	}
}

func timeTemplate() string {
	return `[time]
# Simulated time to run, s. Required; > 0.
duration = 600.0
# Simulated time after which statistics start, s: the running statistics
# (time means, spectra) leave out the first spin_up seconds, in which the
# flow develops from its initial state. Default 0; 0 <= spin_up < duration.
spin_up = 120.0
# Target advective Courant number of the adaptive step. Default 0.5;
# 0 < cfl <= 1.5 (the time scheme is unstable above about 1.7).
# cfl = 0.5
# Upper bound on the adaptive step, s. Default 0 (no bound); >= 0.
# max_step = 0.0
# Fixed step, s: > 0 replaces the adaptive step. Default 0 (adaptive);
# 0 to duration. Not together with max_step.
# fixed_step = 0.0
`
}
