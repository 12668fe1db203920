package stricttoml

import (
	"fmt"
	"math"
	"sort"
	"strconv"
	"strings"
	"unicode"
)

// Problem is one mistake in a file.
type Problem struct {
	// File is the file's name as given; "" for text read without a name,
	// which prints as Doc.
	File string
	// Doc names the kind of file, "case file" or "sweep file"; printed in
	// place of File when that is "".
	Doc string
	// Line is the 1-based line of the key (or of its table header, or of
	// the syntax error); 0 when the file holds no line for it.
	Line int
	// Col is the 1-based column; set for TOML syntax errors only.
	Col int
	// Key is the dotted key, such as "domain.nz"; "" for a syntax error.
	Key string
	// Value is the value as written in the file ("3", `"rough"`), or as
	// held in the decoded struct when the file does not hold it; "" for a
	// missing key or a table.
	Value string
	// Msg says what is wrong, the allowed range and the fix.
	Msg string
}

// Error formats the problem on one line:
//
//	case file line 12: domain.nz = 3: must be an integer from 8 to 8192 (cells along z); ...
func (p *Problem) Error() string {
	var b strings.Builder
	switch {
	case p.File != "":
		b.WriteString(p.File)
	case p.Doc != "":
		b.WriteString(p.Doc)
	default:
		b.WriteString("file")
	}
	if p.Line > 0 {
		fmt.Fprintf(&b, " line %d", p.Line)
		if p.Col > 0 {
			fmt.Fprintf(&b, ", column %d", p.Col)
		}
	}
	b.WriteString(": ")
	if p.Key != "" {
		b.WriteString(p.Key)
		if p.Value != "" {
			b.WriteString(" = ")
			b.WriteString(p.Value)
		}
		b.WriteString(": ")
	}
	b.WriteString(p.Msg)
	return b.String()
}

// Errors is every problem found in one file, in the order of their lines
// (problems without a line last). The readers of case and sweep files
// return it as their error.
type Errors struct {
	Problems []*Problem
}

// Error returns the problems one per line.
func (e *Errors) Error() string {
	lines := make([]string, len(e.Problems))
	for i, p := range e.Problems {
		lines[i] = p.Error()
	}
	return strings.Join(lines, "\n")
}

// Unwrap returns the problems, so errors.As finds a *Problem.
func (e *Errors) Unwrap() []error {
	errs := make([]error, len(e.Problems))
	for i, p := range e.Problems {
		errs[i] = p
	}
	return errs
}

// Problems collects the problems of one file. While parsing it knows which
// keys the text holds and where; when validating a struct built in code it
// knows neither, and every check works on values alone.
type Problems struct {
	list []*Problem
	// Parsing is true while a file is read: defaults are applied and
	// rules about which keys were written are checked.
	Parsing bool
	// doc and file name the file in every problem (Problem.Doc, .File).
	doc, file string
	// pos holds the line and raw value of each key in the text.
	pos map[string]Pos
	// given holds the keys present in the text, whatever their type.
	given map[string]bool
	// bad holds keys that already have a problem; later problems for the
	// same key, or for values derived from it, are dropped so that one
	// mistake gives one line.
	bad map[string]bool
}

// NewProblems returns a collector for checking values built in code (not
// parsing): problems name doc ("case file") and carry no lines.
func NewProblems(doc string) *Problems {
	return newProblems(doc, "", false, nil)
}

func newProblems(doc, file string, parsing bool, pos map[string]Pos) *Problems {
	return &Problems{Parsing: parsing, doc: doc, file: file, pos: pos, given: map[string]bool{}, bad: map[string]bool{}}
}

// Has reports whether the text holds key. Outside parsing it is false.
func (p *Problems) Has(key string) bool { return p.given[key] }

// Used reports whether an optional key is in use: written in the file, or
// non-zero in a struct built in code (nonZero).
func (p *Problems) Used(key string, nonZero bool) bool { return p.Has(key) || nonZero }

// Line returns the line of key, or of the nearest enclosing table the text
// holds, or 0.
func (p *Problems) Line(key string) int { return p.lineOf(key) }

// Empty reports whether no problem has been found so far.
func (p *Problems) Empty() bool { return len(p.list) == 0 }

// OK reports whether key and the tables holding it have no problem so far.
func (p *Problems) OK(key string) bool {
	if p.bad[key] {
		return false
	}
	for k := ParentKey(key); k != ""; k = ParentKey(k) {
		if p.bad[k] {
			return false
		}
	}
	return true
}

// Suppress marks key as having a problem without reporting one: a key
// whose problem is reported under another key that it goes with.
func (p *Problems) Suppress(key string) { p.bad[key] = true }

// Derive marks key as bad when any key it is computed from is bad, so that a
// default computed from a broken value raises no second problem.
func (p *Problems) Derive(key string, from ...string) {
	for _, f := range from {
		if !p.OK(f) {
			p.bad[key] = true
		}
	}
}

// lineOf returns the line of key, or of the nearest enclosing table the text
// holds, or 0. An array element the scanner did not place ("a.rows[2]")
// falls back to the line of its array ("a.rows").
func (p *Problems) lineOf(key string) int { return LineOf(p.pos, key) }

// LineOf returns the line of key in pos (as Scan returns them), or of the
// nearest enclosing table pos holds, or 0. An array element pos does not
// hold ("a.rows[2]") falls back to the line of its array ("a.rows").
func LineOf(pos map[string]Pos, key string) int {
	for k := key; k != ""; k = ParentKey(k) {
		if kp, ok := pos[k]; ok {
			return kp.Line
		}
		if base, _, ok := SplitIndex(k); ok {
			if kp, ok := pos[base]; ok {
				return kp.Line
			}
		}
	}
	return 0
}

// SplitIndex splits the key of an array element, "canopy.patch[1]", into
// the array's key and the index, "canopy.patch" and 1. It reports false for
// a key that does not end in an index. Quoted components end in a quote, so
// a bracket inside one never counts.
func SplitIndex(key string) (base string, i int, ok bool) {
	if !strings.HasSuffix(key, "]") {
		return "", 0, false
	}
	open := strings.LastIndexByte(key, '[')
	if open <= 0 {
		return "", 0, false
	}
	n, err := strconv.Atoi(key[open+1 : len(key)-1])
	if err != nil || n < 0 {
		return "", 0, false
	}
	return key[:open], n, true
}

// Ordinal writes n >= 1 as "1st", "2nd", "3rd", "4th", ..., "11th", "21st".
func Ordinal(n int) string {
	suffix := "th"
	if n%100 < 11 || n%100 > 13 {
		switch n % 10 {
		case 1:
			suffix = "st"
		case 2:
			suffix = "nd"
		case 3:
			suffix = "rd"
		}
	}
	return strconv.Itoa(n) + suffix
}

// ParentKey drops the last component of a dotted key ("a.b.c" → "a.b").
// Quoted components may contain dots, so it walks the key with quotes in
// mind.
func ParentKey(key string) string {
	last, inQuote := -1, false
	for i := 0; i < len(key); i++ {
		switch c := key[i]; {
		case c == '\\' && inQuote:
			i++
		case c == '"':
			inQuote = !inQuote
		case c == '.' && !inQuote:
			last = i
		}
	}
	if last < 0 {
		return ""
	}
	return key[:last]
}

// Add records a problem for key; value is how the value reads in the
// decoded struct (the raw text of the file is used instead when the file
// holds the key). Only the first problem of a key, or of the tables that
// hold it, is kept: one mistake gives one line. A problem of the whole
// file has the key "".
func (p *Problems) Add(key, value, msg string) {
	if !p.OK(key) {
		return // this key or its table already has a problem
	}
	p.bad[key] = true
	if kp, ok := p.pos[key]; ok && kp.Raw != "" {
		value = kp.Raw
	}
	p.list = append(p.list, &Problem{Doc: p.doc, File: p.file, Key: OneLine(key), Value: OneLine(value), Line: p.lineOf(key), Msg: OneLine(msg)})
}

// OneLine escapes line breaks and other control characters, so that each
// problem prints on one line whatever the file holds.
func OneLine(s string) string {
	if !strings.ContainsFunc(s, unicode.IsControl) {
		return s
	}
	var b strings.Builder
	for _, r := range s {
		if unicode.IsControl(r) {
			q := strconv.QuoteRune(r)
			b.WriteString(q[1 : len(q)-1])
			continue
		}
		b.WriteRune(r)
	}
	return b.String()
}

// Addf is Add with a formatted message.
func (p *Problems) Addf(key, value, format string, args ...any) {
	p.Add(key, value, fmt.Sprintf(format, args...))
}

// Err returns the collected problems sorted by line as *Errors, or nil
// when there are none.
func (p *Problems) Err() error {
	if len(p.list) == 0 {
		return nil
	}
	return Sorted(p.list)
}

// Sorted returns list as *Errors, sorted by line with problems without a
// line last (a stable sort: problems of one line keep their order).
func Sorted(list []*Problem) *Errors {
	sort.SliceStable(list, func(i, j int) bool {
		li, lj := list[i].Line, list[j].Line
		if li == 0 || lj == 0 {
			return lj == 0 && li != 0
		}
		return li < lj
	})
	return &Errors{Problems: list}
}

// FormatFloat writes v as the shortest decimal that reads back the same, with
// a short exponent (1.5e-6 rather than 1.5e-06).
func FormatFloat(v float64) string {
	s := strconv.FormatFloat(v, 'g', -1, 64)
	s = strings.Replace(s, "e-0", "e-", 1)
	return strings.Replace(s, "e+0", "e+", 1)
}

// FormatRound writes a value computed from others, such as a suggestion or a
// patch length, to 12 significant digits, so that round-off does not show
// (0.4 rather than 0.39999999999999997).
func FormatRound(v float64) string {
	r, err := strconv.ParseFloat(strconv.FormatFloat(v, 'g', 12, 64), 64)
	if err != nil {
		return FormatFloat(v)
	}
	return FormatFloat(r)
}

// fmtInt writes v in decimal.
func fmtInt(v int64) string { return strconv.FormatInt(v, 10) }

// Note joins the parts of a message that are not empty with "; ".
func Note(parts ...string) string {
	var kept []string
	for _, s := range parts {
		if s != "" {
			kept = append(kept, s)
		}
	}
	return strings.Join(kept, "; ")
}

// MoreThanOne records that the keys given, more than one, are alternatives
// of which choose says to give one; the problem sits on the last of them.
func (p *Problems) MoreThanOne(given []string, choose string) {
	all := "all"
	if len(given) == 2 {
		all = "both"
	}
	p.Add(given[len(given)-1], "", AndList(given)+" are "+all+" given; "+choose)
}

// AndList joins words as "a", "a and b", "a, b and c".
func AndList(words []string) string {
	if len(words) <= 1 {
		return strings.Join(words, "")
	}
	return strings.Join(words[:len(words)-1], ", ") + " and " + words[len(words)-1]
}

// What wraps a short description of the quantity in parentheses.
func What(desc string) string {
	if desc == "" {
		return ""
	}
	return " (" + desc + ")"
}

// Finite reports whether v is neither NaN nor infinite.
func Finite(v float64) bool { return !math.IsNaN(v) && !math.IsInf(v, 0) }

// Require records a problem when the text does not hold key. desc says what
// the key is, example is a line to add. It reports whether the key is there.
func (p *Problems) Require(key, desc, example string) bool {
	if !p.Parsing || p.Has(key) {
		return true
	}
	table := ParentKey(key)
	where := "at the top of the file"
	if table != "" {
		where = "under [" + table + "]"
	}
	p.Addf(key, "", "missing; required: %s; add e.g. %s %s", desc, example, where)
	return false
}

// outOfRange records that the value of key breaks rule ("must be ..."),
// with the quantity's description and a hint, and returns false.
func (p *Problems) outOfRange(key, value, rule, desc, hint string) bool {
	p.Add(key, value, Note(rule+What(desc), hint))
	return false
}

// Positive checks 0 < v < ∞.
func (p *Problems) Positive(key string, v float64, desc, hint string) bool {
	if v > 0 && !math.IsInf(v, 1) {
		return true
	}
	return p.outOfRange(key, FormatFloat(v), "must be a finite number > 0", desc, hint)
}

// AtLeast checks lo <= v < ∞.
func (p *Problems) AtLeast(key string, v, lo float64, desc, hint string) bool {
	if v >= lo && !math.IsInf(v, 1) {
		return true
	}
	return p.outOfRange(key, FormatFloat(v), "must be a finite number >= "+FormatFloat(lo), desc, hint)
}

// FloatRange checks lo <= v <= hi.
func (p *Problems) FloatRange(key string, v, lo, hi float64, desc, hint string) bool {
	if v >= lo && v <= hi {
		return true
	}
	return p.outOfRange(key, FormatFloat(v), "must be from "+FormatFloat(lo)+" to "+FormatFloat(hi), desc, hint)
}

// OpenRange checks lo < v < hi.
func (p *Problems) OpenRange(key string, v, lo, hi float64, desc, hint string) bool {
	if v > lo && v < hi {
		return true
	}
	return p.outOfRange(key, FormatFloat(v), "must be > "+FormatFloat(lo)+" and < "+FormatFloat(hi), desc, hint)
}

// FiniteValue checks that v is a finite number.
func (p *Problems) FiniteValue(key string, v float64, desc, hint string) bool {
	if Finite(v) {
		return true
	}
	return p.outOfRange(key, FormatFloat(v), "must be a finite number", desc, hint)
}

// IntRange checks lo <= v <= hi for an integer key.
func (p *Problems) IntRange(key string, v, lo, hi int64, desc, hint string) bool {
	if v >= lo && v <= hi {
		return true
	}
	return p.outOfRange(key, fmtInt(v), "must be an integer from "+fmtInt(lo)+" to "+fmtInt(hi), desc, hint)
}

// OneOf checks that v is one of allowed, suggesting the closest name.
func (p *Problems) OneOf(key, v string, allowed []string, hint string) bool {
	for _, a := range allowed {
		if v == a {
			return true
		}
	}
	quoted := make([]string, len(allowed))
	for i, a := range allowed {
		quoted[i] = strconv.Quote(a)
	}
	msg := "must be one of " + strings.Join(quoted, ", ")
	if s := Closest(v, allowed); s != "" {
		msg += "; did you mean " + strconv.Quote(s) + "?"
	}
	p.Add(key, strconv.Quote(v), Note(msg, hint))
	return false
}

// OnlyWith records a problem when an optional key is in use (written in the
// file, or non-zero in a Case built in code) although the setting it belongs
// to is off. It reports whether the key is in use.
func (p *Problems) OnlyWith(key string, nonZero bool, value, needs string) bool {
	if !(p.Has(key) || nonZero) {
		return false
	}
	p.Add(key, value, "only applies when "+needs+"; remove the key or change that setting")
	return true
}
