package casefile

import (
	"fmt"
	"math"
	"sort"
	"strconv"
	"strings"
	"unicode"
)

// Problem is one mistake in a case file.
type Problem struct {
	// File is the case file's name as given to Load; "" for text given to
	// Parse, printed as "case file".
	File string
	// Line is the 1-based line of the key (or of its table header, or of
	// the syntax error); 0 when the file holds no line for it.
	Line int
	// Col is the 1-based column; set for TOML syntax errors only.
	Col int
	// Key is the dotted key, such as "domain.nz"; "" for a syntax error.
	Key string
	// Value is the value as written in the file ("3", `"rough"`), or as
	// held in the Case when the file does not hold it; "" for a missing key
	// or a table.
	Value string
	// Msg says what is wrong, the allowed range and the fix.
	Msg string
}

// Error formats the problem on one line:
//
//	case file line 12: domain.nz = 3: must be an integer from 8 to 8192 (cells along z); ...
func (p *Problem) Error() string {
	var b strings.Builder
	if p.File != "" {
		b.WriteString(p.File)
	} else {
		b.WriteString("case file")
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

// Errors is every problem found in one case file, in the order of their
// lines (problems without a line last). Parse, Load and Case.Validate return
// it as their error.
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

// problems collects the problems of one case. While parsing it knows which
// keys the text holds and where; when validating a Case built in code it
// knows neither, and every check works on values alone.
type problems struct {
	list []*Problem
	// parsing is true inside Parse: defaults are applied and rules about
	// which keys were written are checked.
	parsing bool
	// pos holds the line and raw value of each key in the text.
	pos map[string]keyPos
	// given holds the keys present in the text, whatever their type.
	given map[string]bool
	// bad holds keys that already have a problem; later problems for the
	// same key, or for values derived from it, are dropped so that one
	// mistake gives one line.
	bad map[string]bool
}

func newProblems(parsing bool, pos map[string]keyPos) *problems {
	return &problems{parsing: parsing, pos: pos, given: map[string]bool{}, bad: map[string]bool{}}
}

// has reports whether the text holds key. Outside Parse it is false.
func (p *problems) has(key string) bool { return p.given[key] }

// used reports whether an optional key is in use: written in the file, or
// non-zero in a Case built in code (nonZero).
func (p *problems) used(key string, nonZero bool) bool { return p.has(key) || nonZero }

// ok reports whether key and the tables holding it have no problem so far.
func (p *problems) ok(key string) bool {
	if p.bad[key] {
		return false
	}
	for k := parentKey(key); k != ""; k = parentKey(k) {
		if p.bad[k] {
			return false
		}
	}
	return true
}

// derive marks key as bad when any key it is computed from is bad, so that a
// default computed from a broken value raises no second problem.
func (p *problems) derive(key string, from ...string) {
	for _, f := range from {
		if !p.ok(f) {
			p.bad[key] = true
		}
	}
}

// lineOf returns the line of key, or of the nearest enclosing table the text
// holds, or 0. An array element the scanner did not place ("a.rows[2]")
// falls back to the line of its array ("a.rows").
func (p *problems) lineOf(key string) int {
	for k := key; k != ""; k = parentKey(k) {
		if kp, ok := p.pos[k]; ok {
			return kp.line
		}
		if base, _, ok := splitIndex(k); ok {
			if kp, ok := p.pos[base]; ok {
				return kp.line
			}
		}
	}
	return 0
}

// splitIndex splits the key of an array element, "canopy.patch[1]", into
// the array's key and the index, "canopy.patch" and 1. It reports false for
// a key that does not end in an index. Quoted components end in a quote, so
// a bracket inside one never counts.
func splitIndex(key string) (base string, i int, ok bool) {
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

// ordinal writes n >= 1 as "1st", "2nd", "3rd", "4th", ..., "11th", "21st".
func ordinal(n int) string {
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

// parentKey drops the last component of a dotted key ("a.b.c" → "a.b").
// Quoted components may contain dots, so it walks the key with quotes in
// mind.
func parentKey(key string) string {
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

// add records a problem for key; value is how the value reads in the Case
// (the raw text of the file is used instead when the file holds the key).
func (p *problems) add(key, value, msg string) {
	if !p.ok(key) {
		return // this key or its table already has a problem
	}
	p.bad[key] = true
	if kp, ok := p.pos[key]; ok && kp.raw != "" {
		value = kp.raw
	}
	p.list = append(p.list, &Problem{Key: oneLine(key), Value: oneLine(value), Line: p.lineOf(key), Msg: oneLine(msg)})
}

// oneLine escapes line breaks and other control characters, so that each
// problem prints on one line whatever the file holds.
func oneLine(s string) string {
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

// addf is add with a formatted message.
func (p *problems) addf(key, value, format string, args ...any) {
	p.add(key, value, fmt.Sprintf(format, args...))
}

// err returns the collected problems sorted by line as *Errors, with file
// set on each, or nil when there are none.
func (p *problems) err(file string) error {
	if len(p.list) == 0 {
		return nil
	}
	sort.SliceStable(p.list, func(i, j int) bool {
		li, lj := p.list[i].Line, p.list[j].Line
		if li == 0 || lj == 0 {
			return lj == 0 && li != 0
		}
		return li < lj
	})
	for _, q := range p.list {
		q.File = file
	}
	return &Errors{Problems: p.list}
}

// fmtFloat writes v as the shortest decimal that reads back the same, with
// a short exponent (1.5e-6 rather than 1.5e-06).
func fmtFloat(v float64) string {
	s := strconv.FormatFloat(v, 'g', -1, 64)
	s = strings.Replace(s, "e-0", "e-", 1)
	return strings.Replace(s, "e+0", "e+", 1)
}

// fmtRound writes a value computed from others, such as a suggestion or a
// patch length, to 12 significant digits, so that round-off does not show
// (0.4 rather than 0.39999999999999997).
func fmtRound(v float64) string {
	r, err := strconv.ParseFloat(strconv.FormatFloat(v, 'g', 12, 64), 64)
	if err != nil {
		return fmtFloat(v)
	}
	return fmtFloat(r)
}

// fmtInt writes v in decimal.
func fmtInt(v int64) string { return strconv.FormatInt(v, 10) }

// note joins the parts of a message that are not empty with "; ".
func note(parts ...string) string {
	var kept []string
	for _, s := range parts {
		if s != "" {
			kept = append(kept, s)
		}
	}
	return strings.Join(kept, "; ")
}

// andList joins words as "a", "a and b", "a, b and c".
func andList(words []string) string {
	if len(words) <= 1 {
		return strings.Join(words, "")
	}
	return strings.Join(words[:len(words)-1], ", ") + " and " + words[len(words)-1]
}

// what wraps a short description of the quantity in parentheses.
func what(desc string) string {
	if desc == "" {
		return ""
	}
	return " (" + desc + ")"
}

// finite reports whether v is neither NaN nor infinite.
func finite(v float64) bool { return !math.IsNaN(v) && !math.IsInf(v, 0) }

// require records a problem when the text does not hold key. desc says what
// the key is, example is a line to add. It reports whether the key is there.
func (p *problems) require(key, desc, example string) bool {
	if !p.parsing || p.has(key) {
		return true
	}
	table := parentKey(key)
	where := "at the top of the file"
	if table != "" {
		where = "under [" + table + "]"
	}
	p.addf(key, "", "missing; required: %s; add e.g. %s %s", desc, example, where)
	return false
}

// positive checks 0 < v < ∞.
func (p *problems) positive(key string, v float64, desc, hint string) bool {
	if v > 0 && !math.IsInf(v, 1) {
		return true
	}
	p.add(key, fmtFloat(v), note("must be a finite number > 0"+what(desc), hint))
	return false
}

// atLeast checks lo <= v < ∞.
func (p *problems) atLeast(key string, v, lo float64, desc, hint string) bool {
	if v >= lo && !math.IsInf(v, 1) {
		return true
	}
	p.add(key, fmtFloat(v), note("must be a finite number >= "+fmtFloat(lo)+what(desc), hint))
	return false
}

// floatRange checks lo <= v <= hi.
func (p *problems) floatRange(key string, v, lo, hi float64, desc, hint string) bool {
	if v >= lo && v <= hi {
		return true
	}
	p.add(key, fmtFloat(v), note("must be from "+fmtFloat(lo)+" to "+fmtFloat(hi)+what(desc), hint))
	return false
}

// openRange checks lo < v < hi.
func (p *problems) openRange(key string, v, lo, hi float64, desc, hint string) bool {
	if v > lo && v < hi {
		return true
	}
	p.add(key, fmtFloat(v), note("must be > "+fmtFloat(lo)+" and < "+fmtFloat(hi)+what(desc), hint))
	return false
}

// finiteValue checks that v is a finite number.
func (p *problems) finiteValue(key string, v float64, desc, hint string) bool {
	if finite(v) {
		return true
	}
	p.add(key, fmtFloat(v), note("must be a finite number"+what(desc), hint))
	return false
}

// intRange checks lo <= v <= hi for an integer key.
func (p *problems) intRange(key string, v, lo, hi int64, desc, hint string) bool {
	if v >= lo && v <= hi {
		return true
	}
	p.add(key, fmtInt(v), note("must be an integer from "+fmtInt(lo)+" to "+fmtInt(hi)+what(desc), hint))
	return false
}

// oneOf checks that v is one of allowed, suggesting the closest name.
func (p *problems) oneOf(key, v string, allowed []string, hint string) bool {
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
	if s := closest(v, allowed); s != "" {
		msg += "; did you mean " + strconv.Quote(s) + "?"
	}
	p.add(key, strconv.Quote(v), note(msg, hint))
	return false
}

// onlyWith records a problem when an optional key is in use (written in the
// file, or non-zero in a Case built in code) although the setting it belongs
// to is off. It reports whether the key is in use.
func (p *problems) onlyWith(key string, nonZero bool, value, needs string) bool {
	if !(p.has(key) || nonZero) {
		return false
	}
	p.add(key, value, "only applies when "+needs+"; remove the key or change that setting")
	return true
}
