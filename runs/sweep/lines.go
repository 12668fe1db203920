package sweep

import (
	"strconv"
	"strings"
)

// The TOML library does not tell where a key sits, so the lines of a sweep
// file's keys come from this small scanner. It runs only over text the
// library has already accepted, and it knows just enough TOML for sweep
// files: table headers, arrays of tables ([[axis]], counted from 0 as
// axis[0], axis[1], ...), plain and dotted keys, inline tables (their keys
// take the line of the table), multi-line arrays and strings, and comments.

// scanLines returns the line of each key of the text, as dotted keys with
// array-of-tables elements indexed: "base", "axis[1]", "axis[1].log",
// "slurm.memory".
func scanLines(text string) map[string]int {
	lines := map[string]int{}
	counts := map[string]int{} // [[name]] elements seen
	prefix := ""
	depth := 0      // open brackets and braces of a value spanning lines
	multiline := "" // the delimiter of an open multi-line string
	for n, line := range strings.Split(text, "\n") {
		ln := n + 1
		s := line
		if multiline != "" || depth > 0 {
			rest, ok := skipValue(s, &depth, &multiline)
			if !ok {
				continue
			}
			s = rest
			if strings.TrimSpace(s) == "" {
				continue
			}
		}
		t := strings.TrimSpace(s)
		switch {
		case t == "" || t[0] == '#':
			continue
		case strings.HasPrefix(t, "[["):
			name := keyPath(strings.TrimSpace(headerName(t[2:], "]]")), prefixOfArray(counts))
			i := counts[name]
			counts[name] = i + 1
			prefix = name + "[" + strconv.Itoa(i) + "]"
			lines[prefix] = ln
			continue
		case t[0] == '[':
			prefix = keyPath(strings.TrimSpace(headerName(t[1:], "]")), prefixOfArray(counts))
			if _, ok := lines[prefix]; !ok {
				lines[prefix] = ln
			}
			continue
		}
		eq := findEquals(t)
		if eq < 0 {
			continue
		}
		key := joinKey(prefix, normaliseKey(t[:eq]))
		if _, ok := lines[key]; !ok {
			lines[key] = ln
		}
		value := strings.TrimSpace(t[eq+1:])
		if strings.HasPrefix(value, "{") {
			inlineKeys(key, value, ln, lines)
		}
		skipValue(value, &depth, &multiline)
	}
	return lines
}

// headerName returns the text of a table header up to its closing
// brackets.
func headerName(s, closing string) string {
	if i := strings.Index(s, closing); i >= 0 {
		return s[:i]
	}
	return s
}

// prefixOfArray returns a function that indexes the components of a dotted
// header that name arrays of tables seen so far: in a sweep file [axis.log]
// after [[axis]] belongs to the last axis.
func prefixOfArray(counts map[string]int) func(string) string {
	return func(name string) string {
		if n, ok := counts[name]; ok && n > 0 {
			return name + "[" + strconv.Itoa(n-1) + "]"
		}
		return name
	}
}

// keyPath normalises a dotted header name and indexes its leading parts
// that name arrays of tables.
func keyPath(name string, index func(string) string) string {
	return fixIndexed(splitDotted(name), index)
}

// fixIndexed rebuilds a dotted path, indexing every leading part that is
// an array of tables.
func fixIndexed(parts []string, index func(string) string) string {
	out := ""
	plain := ""
	for i, p := range parts {
		if i > 0 {
			plain += "."
		}
		plain += p
		if i < len(parts)-1 {
			idx := index(plain)
			// idx is plain with an index appended, or plain itself
			if i == 0 {
				out = idx
			} else {
				out += "." + p + strings.TrimPrefix(idx, plain)
			}
			continue
		}
		if i == 0 {
			out = p
		} else {
			out += "." + p
		}
	}
	return out
}

// normaliseKey turns a key as written (`slurm . memory`, `"base"`) into its
// dotted form.
func normaliseKey(k string) string {
	return strings.Join(splitDotted(strings.TrimSpace(k)), ".")
}

// splitDotted splits a dotted key at the dots outside quotes and unquotes
// each part.
func splitDotted(k string) []string {
	var parts []string
	var cur strings.Builder
	quote := byte(0)
	for i := 0; i < len(k); i++ {
		c := k[i]
		switch {
		case quote != 0:
			if c == quote {
				quote = 0
				continue
			}
			if c == '\\' && quote == '"' && i+1 < len(k) {
				i++
				c = k[i]
			}
			cur.WriteByte(c)
		case c == '"' || c == '\'':
			quote = c
		case c == '.':
			parts = append(parts, strings.TrimSpace(cur.String()))
			cur.Reset()
		case c == ' ' || c == '\t':
		default:
			cur.WriteByte(c)
		}
	}
	return append(parts, strings.TrimSpace(cur.String()))
}

func joinKey(prefix, key string) string {
	if prefix == "" {
		return key
	}
	return prefix + "." + key
}

// findEquals returns the index of the = that ends a key, outside quotes, or
// -1.
func findEquals(s string) int {
	quote := byte(0)
	for i := 0; i < len(s); i++ {
		c := s[i]
		switch {
		case quote != 0:
			if c == quote {
				quote = 0
			}
		case c == '"' || c == '\'':
			quote = c
		case c == '=':
			return i
		case c == '#':
			return -1
		}
	}
	return -1
}

// inlineKeys records the keys of an inline table at the line of the table.
func inlineKeys(key, value string, ln int, lines map[string]int) {
	depth, start := 0, 0
	quote := byte(0)
	var path []string
	cur := key
	for i := 0; i < len(value); i++ {
		c := value[i]
		switch {
		case quote != 0:
			if c == '\\' && quote == '"' {
				i++
				continue
			}
			if c == quote {
				quote = 0
			}
		case c == '"' || c == '\'':
			quote = c
		case c == '{':
			depth++
			path = append(path, cur)
			start = i + 1
		case c == '}':
			depth--
			if len(path) > 0 {
				path = path[:len(path)-1]
			}
			if depth == 0 {
				return
			}
		case c == '[':
			// skip the array's contents
			d := 1
			for i++; i < len(value) && d > 0; i++ {
				switch value[i] {
				case '[':
					d++
				case ']':
					d--
				}
			}
			i--
		case c == ',':
			start = i + 1
		case c == '=':
			if len(path) == 0 {
				return
			}
			k := joinKey(path[len(path)-1], normaliseKey(value[start:i]))
			if _, ok := lines[k]; !ok {
				lines[k] = ln
			}
			cur = k
		}
	}
}

// skipValue advances over the rest of a value that may span lines,
// updating the bracket depth and the open multi-line string. It returns the
// text after the value ends on this line and whether it ended.
func skipValue(s string, depth *int, multiline *string) (string, bool) {
	for i := 0; i < len(s); i++ {
		if *multiline != "" {
			j := strings.Index(s[i:], *multiline)
			if j < 0 {
				return "", false
			}
			i += j + len(*multiline) - 1
			*multiline = ""
			if *depth == 0 {
				return s[i+1:], true
			}
			continue
		}
		c := s[i]
		switch c {
		case '#':
			return "", *depth == 0
		case '"', '\'':
			delim := string([]byte{c, c, c})
			if strings.HasPrefix(s[i:], delim) {
				*multiline = delim
				i += 2
				continue
			}
			// a one-line string
			for i++; i < len(s) && s[i] != c; i++ {
				if s[i] == '\\' && c == '"' {
					i++
				}
			}
		case '[', '{':
			*depth++
		case ']', '}':
			if *depth > 0 {
				*depth--
			}
		}
	}
	return "", *depth == 0 && *multiline == ""
}

// lineOf returns the line of key, or of the nearest enclosing key the
// scanner placed; 0 when none.
func lineOf(lines map[string]int, key string) int {
	for k := key; k != ""; k = parentOf(k) {
		if l, ok := lines[k]; ok {
			return l
		}
	}
	return 0
}

// parentOf returns key without its last component: "axis[1].log.from" →
// "axis[1].log" → "axis[1]" → "" (an index counts as a component only of
// array elements the scanner saw).
func parentOf(key string) string {
	dot := strings.LastIndexByte(key, '.')
	if open := strings.LastIndexByte(key, '['); open > dot && strings.HasSuffix(key, "]") {
		return key[:open]
	}
	if dot >= 0 {
		return key[:dot]
	}
	return ""
}
