package casefile

import (
	"errors"
	"fmt"
	"os"
	"path/filepath"
	"reflect"

	"github.com/BurntSushi/toml"
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
	check    func(c *Case, p *problems)
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

func parse(text []byte, file string) (*Case, error) {
	var raw map[string]any
	if _, err := toml.Decode(string(text), &raw); err != nil {
		return nil, syntaxError(err, file)
	}
	p := newProblems(true, scanPositions(string(text)))
	if len(raw) == 0 {
		p.add("", "", "the file sets no keys; start from the commented template that `rollerbed init FILE` writes")
		return nil, p.err(file)
	}
	c := &Case{Text: string(text)}
	decodeTable(raw, nil, reflect.ValueOf(c).Elem(), p)
	for _, s := range sections {
		s.check(c, p)
	}
	if err := p.err(file); err != nil {
		return nil, err
	}
	resolvePaths(c, file)
	return c, nil
}

// resolvePaths makes the relative file names of a case read from file
// relative to the folder that holds it. Text given to Parse has no folder,
// and its names stay as written.
func resolvePaths(c *Case, file string) {
	if file == "" || c.Canopy == nil || c.Canopy.ProfileFile == "" || filepath.IsAbs(c.Canopy.ProfileFile) {
		return
	}
	c.Canopy.ProfileFile = filepath.Join(filepath.Dir(file), c.Canopy.ProfileFile)
}

// syntaxError turns an error of the TOML parser into a one-problem *Errors.
func syntaxError(err error, file string) error {
	var pe toml.ParseError
	if !errors.As(err, &pe) {
		return &Errors{Problems: []*Problem{{File: file, Msg: oneLine("cannot read the TOML: " + err.Error())}}}
	}
	msg := "TOML syntax error: " + pe.Message
	if pe.LastKey != "" {
		msg += " (after key " + pe.LastKey + ")"
	}
	msg += "; see https://toml.io for the syntax, or compare with the template that `rollerbed init FILE` writes"
	return &Errors{Problems: []*Problem{{File: file, Line: pe.Position.Line, Col: pe.Position.Col, Msg: oneLine(msg)}}}
}

// Validate checks the values of a complete Case, such as Parse returns or a
// sweep derives from one by changing fields. It applies no defaults: every
// field must hold a valid value, and optional settings that are off must be
// zero (Domain.Cluster.At = 0 for no second cluster, Bed.Roughness = 0
// unless the bed is rough, Canopy.Height = 0 when the canopy is given as a
// profile, and so on). Problems carry no line numbers.
// It returns nil or *Errors.
func (c *Case) Validate() error {
	p := newProblems(false, nil)
	for _, s := range sections {
		s.check(c, p)
	}
	return p.err("")
}
