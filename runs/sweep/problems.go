package sweep

import (
	"fmt"
	"sort"
	"strconv"
	"strings"

	"rollerbed/io/casefile"
)

// Problem is one mistake in a sweep file, or in a member case the sweep
// makes from its base: the case file's problem type, so both print alike
// (FILE line N: key = value: what is wrong and the fix). Problems of a
// sweep given without a file name name it "sweep file".
type Problem = casefile.Problem

// Errors is every problem found in a sweep, in the order of their lines
// (problems without a line last). Parse, Load and NewPlan return it.
type Errors = casefile.Errors

// fileLabel is the name problems print for the sweep file at path.
func fileLabel(path string) string {
	if path == "" {
		return "sweep file"
	}
	return path
}

// problems collects the problems of one sweep file.
type problems struct {
	file  string
	lines map[string]int
	list  []*Problem
}

// add records a problem of key, placing it at the key's line.
func (p *problems) add(key, value, msg string) {
	p.list = append(p.list, &Problem{File: p.file, Line: lineOf(p.lines, key), Key: key, Value: value, Msg: oneLine(msg)})
}

func (p *problems) err() error {
	if len(p.list) == 0 {
		return nil
	}
	sort.SliceStable(p.list, func(i, j int) bool {
		a, b := p.list[i].Line, p.list[j].Line
		if a == 0 || b == 0 {
			return a != 0 && b == 0
		}
		return a < b
	})
	return &Errors{Problems: p.list}
}

// oneLine keeps a message on one line.
func oneLine(s string) string {
	return strings.Join(strings.Fields(s), " ")
}

// tomlType names the TOML type of a decoded value for messages.
func tomlType(v any) string {
	switch v.(type) {
	case string:
		return "a string"
	case int64:
		return "an integer"
	case float64:
		return "a float"
	case bool:
		return "a boolean"
	case map[string]any:
		return "a table"
	case []map[string]any:
		return "an array of tables"
	case []any:
		return "an array"
	}
	return "a date or time"
}

// fmtValue writes a decoded TOML value the way a sweep file would: strings
// quoted, floats with a decimal point or exponent, arrays shortened.
func fmtValue(v any) string {
	switch x := v.(type) {
	case string:
		return strconv.Quote(x)
	case int64:
		return strconv.FormatInt(x, 10)
	case float64:
		return fmtFloat(x)
	case bool:
		return strconv.FormatBool(x)
	case []any:
		if len(x) <= 4 {
			parts := make([]string, len(x))
			for i, e := range x {
				parts[i] = fmtValue(e)
			}
			return "[" + strings.Join(parts, ", ") + "]"
		}
		return "[...]"
	case map[string]any, []map[string]any:
		return "{...}"
	}
	return fmt.Sprint(v)
}

// fmtFloat formats a float as TOML does: the shortest text that reads
// back to the same number, always with a decimal point or an exponent.
func fmtFloat(f float64) string {
	s := strconv.FormatFloat(f, 'g', -1, 64)
	switch s {
	case "+Inf":
		return "inf"
	case "-Inf":
		return "-inf"
	case "NaN":
		return "nan"
	}
	if !strings.ContainsAny(s, ".eEn") {
		s += ".0"
	}
	return s
}

// ordinal returns "1st", "2nd", "3rd", "4th", ...
func ordinal(n int) string {
	suffix := "th"
	switch {
	case n%100 >= 11 && n%100 <= 13:
	case n%10 == 1:
		suffix = "st"
	case n%10 == 2:
		suffix = "nd"
	case n%10 == 3:
		suffix = "rd"
	}
	return strconv.Itoa(n) + suffix
}

// closest returns the candidate nearest to s: equal apart from letter case,
// the one candidate that starts with s (or that s starts with), or within a
// small edit distance (1 for short words, 2 from five letters
// on, 3 from nine). It returns "" when none is close or two tie.
func closest(s string, candidates []string) string {
	for _, c := range candidates {
		if strings.EqualFold(s, c) {
			return c
		}
	}
	var prefixed []string
	for _, c := range candidates {
		if len(s) >= 3 && (strings.HasPrefix(c, s) || strings.HasPrefix(s, c)) {
			prefixed = append(prefixed, c)
		}
	}
	if len(prefixed) == 1 {
		return prefixed[0]
	}
	limit := 1
	if len(s) >= 5 {
		limit = 2
	}
	if len(s) >= 9 {
		limit = 3
	}
	best, bestD, tie := "", limit+1, false
	for _, c := range candidates {
		d := editDistance(s, c)
		switch {
		case d < bestD:
			best, bestD, tie = c, d, false
		case d == bestD:
			tie = true
		}
	}
	if tie {
		return ""
	}
	return best
}

// editDistance is the Levenshtein distance between a and b in bytes; keys
// are ASCII. Long strings are not worth comparing.
func editDistance(a, b string) int {
	if len(a) > 64 || len(b) > 64 {
		return 1 << 20
	}
	prev := make([]int, len(b)+1)
	cur := make([]int, len(b)+1)
	for j := range prev {
		prev[j] = j
	}
	for i := 1; i <= len(a); i++ {
		cur[0] = i
		for j := 1; j <= len(b); j++ {
			cost := 1
			if a[i-1] == b[j-1] {
				cost = 0
			}
			cur[j] = min(prev[j]+1, cur[j-1]+1, prev[j-1]+cost)
		}
		prev, cur = cur, prev
	}
	return prev[len(b)]
}
