package casefile

import (
	"fmt"
	"os"

	"rollerbed/io/stricttoml"
)

// Case is one run as a case file describes it, with every default filled
// in. The toml tags are the keys of the file; see Template for the meaning,
// unit, default and range of each.
type Case struct {
	// Title is free text describing the run, copied into the outputs.
	Title string `toml:"title"`

	Domain Domain `toml:"domain"`
	Fluid  Fluid  `toml:"fluid"`
	Bed    Bed    `toml:"bed"`
	Top    Top    `toml:"top"`
	// Canopy is nil when the file has no [canopy] table: a bare bed.
	Canopy     *Canopy    `toml:"canopy"`
	Turbulence Turbulence `toml:"turbulence"`
	// Scalars are the [[scalar]] tables, in the order of the file: the
	// passive scalars the flow carries. Empty (the default) is a run
	// without scalars.
	Scalars  []Scalar `toml:"scalar"`
	Forcing  Forcing  `toml:"forcing"`
	Initial  Initial  `toml:"initial"`
	Time     Time     `toml:"time"`
	Numerics Numerics `toml:"numerics"`
	Output   Output   `toml:"output"`

	// Text is the case file as read, kept for provenance.
	Text string `toml:"-"`
}

// section is one table of the case file: its check applies the defaults
// (while parsing) and validates the values. Sections run in this order, so a
// check may use the settled values of the sections before it.
type section struct {
	name     string
	check    func(c *Case, p *stricttoml.Problems)
	template func() string
}

var sections = []section{
	{"domain", checkDomain, domainTemplate},
	{"fluid", checkFluid, fluidTemplate},
	{"bed", checkBed, bedTemplate},
	{"top", checkTop, topTemplate},
	{"canopy", checkCanopy, canopyTemplate},
	{"turbulence", checkTurbulence, turbulenceTemplate},
	{"scalar", checkScalars, scalarTemplate},
	{"forcing", checkForcing, forcingTemplate},
	{"initial", checkInitial, initialTemplate},
	{"time", checkTime, timeTemplate},
	{"numerics", checkNumerics, numericsTemplate},
	{"output", checkOutput, outputTemplate},
}

// Parse reads a case from TOML text. It rejects syntax errors, unknown keys,
// values of the wrong type, missing required keys and values out of range,
// and reports all of them at once as *Errors. On success every default is
// filled in and Case.Text holds text.
func Parse(text []byte) (*Case, error) {
	return parse(text, "")
}

// Load reads and parses the case file at path. Its problems carry the path
// as their File. A relative canopy.profile_file is resolved against the
// folder of path and stored so in the Case.
func Load(path string) (*Case, error) {
	text, err := os.ReadFile(path)
	if err != nil {
		return nil, fmt.Errorf("reading case file: %w (write a commented template with `rollerbed init %s`)", err, path)
	}
	return parse(text, path)
}

// format is how case files name themselves in problems.
var format = stricttoml.Format{Doc: "case file", Example: "the template that `rollerbed init FILE` writes"}

// Problem is one mistake in a case file: its key, the value as written,
// what is wrong and the fix, and the line where the key sits.
type Problem = stricttoml.Problem

// Errors is every problem found in one case file, in the order of their
// lines (problems without a line last). Parse, Load and Case.Validate
// return it as their error.
type Errors = stricttoml.Errors

func parse(text []byte, file string) (*Case, error) {
	doc, err := format.Read(text, file)
	if err != nil {
		return nil, err
	}
	p := doc.Problems
	if doc.Empty() {
		p.Add("", "", "the file sets no keys; start from the commented template that `rollerbed init FILE` writes")
		return nil, p.Err()
	}
	c := &Case{Text: string(text)}
	doc.Decode(c)
	for _, s := range sections {
		s.check(c, p)
	}
	if err := p.Err(); err != nil {
		return nil, err
	}
	resolvePaths(c, file)
	return c, nil
}

// Validate checks the values of a complete Case, such as Parse returns or a
// sweep derives from one by changing fields. It applies no defaults: every
// field must hold a valid value, and optional settings that are off must be
// zero (Domain.Cluster.At = 0 for no second cluster, Bed.Roughness = 0
// unless the bed is rough, Canopy.Height = 0 when the canopy is given as a
// profile, and so on). Problems carry no line numbers.
// It returns nil or *Errors.
func (c *Case) Validate() error {
	p := stricttoml.NewProblems(format.Doc)
	for _, s := range sections {
		s.check(c, p)
	}
	return p.Err()
}
