package stricttoml

import (
	"strconv"
	"strings"
	"unicode/utf8"

	"github.com/BurntSushi/toml"
)

// MaxDepth bounds how deeply a file may nest: the components of a table
// header or dotted key plus the arrays and inline tables around a value.
// Case and sweep files need fewer than ten levels; the TOML library's time
// and memory grow with the square of the depth (20 000 nested inline
// tables take minutes and tens of GB), so deeper text is refused before it
// is parsed.
const MaxDepth = 128

// Pos is where a key sits in the text.
type Pos struct {
	Line int    // 1-based line where the key, table header or array element starts
	Raw  string // the value as written, shortened to one line; "" for a table
}

// Scan finds the line of every key and table header in text. Keys are
// dotted paths in the form KeyString gives (components quoted where TOML
// needs it); the elements of an array of tables, and of an inline array,
// get an index, "name[0]", "name[1]", ... A table created implicitly by a
// dotted key or a nested header sits at the line where it first appears.
//
// Scan reads each byte a bounded number of times, and stops at the first
// place where the text nests deeper than MaxDepth: tooDeep is then that
// line (0 when the text is within the bound), and the positions found so
// far are returned.
//
// The scanner is tolerant: on text that is not valid TOML it returns what it
// found without failing.
func Scan(text string) (pos map[string]Pos, tooDeep int) {
	sc := &scanner{s: text, line: 1, pos: map[string]Pos{}, count: map[string]int{}, current: map[string]string{}}
	sc.document()
	return sc.pos, sc.tooDeep
}

// KeyString joins key components as the schema walk and Scan name keys.
func KeyString(parts []string) string { return strings.Join(parts, ".") }

// Component returns a key component as it is written in a dotted key:
// bare when TOML allows it, quoted otherwise.
func Component(name string) string { return toml.Key{name}.String() }

type scanner struct {
	s    string
	i    int
	line int
	pos  map[string]Pos
	// level is the nesting depth at the current place: key components
	// of the current table and key, and the arrays and inline tables
	// open around the value. tooDeep is the line where it first passed
	// MaxDepth; the scan then stops.
	level   int
	tooDeep int
	// count is the number of elements seen per array of tables, and
	// current maps an array's path to the last component of its latest
	// element ("scalar" → "scalar[1]").
	count   map[string]int
	current map[string]string
}

func (sc *scanner) eof() bool { return sc.i >= len(sc.s) }

func (sc *scanner) peek() byte {
	if sc.eof() {
		return 0
	}
	return sc.s[sc.i]
}

func (sc *scanner) next() {
	if sc.eof() {
		return
	}
	if sc.s[sc.i] == '\n' {
		sc.line++
	}
	sc.i++
}

func (sc *scanner) skipBlank() {
	for c := sc.peek(); c == ' ' || c == '\t'; c = sc.peek() {
		sc.next()
	}
}

// skipSpace skips blanks, line ends and comments.
func (sc *scanner) skipSpace() {
	for !sc.eof() {
		switch sc.peek() {
		case ' ', '\t', '\r', '\n':
			sc.next()
		case '#':
			for !sc.eof() && sc.peek() != '\n' {
				sc.next()
			}
		default:
			return
		}
	}
}

func (sc *scanner) skipLine() {
	for !sc.eof() && sc.peek() != '\n' {
		sc.next()
	}
}

func (sc *scanner) record(key string, line int, raw string) {
	if _, seen := sc.pos[key]; !seen {
		sc.pos[key] = Pos{Line: line, Raw: raw}
	}
}

// deeper adds n levels of nesting and reports whether the scan may go on:
// past MaxDepth it records the line and moves to the end of the text, so
// every loop of the scanner ends.
func (sc *scanner) deeper(n int) bool {
	sc.level += n
	if sc.level <= MaxDepth {
		return true
	}
	if sc.tooDeep == 0 {
		sc.tooDeep = sc.line
	}
	sc.i = len(sc.s)
	return false
}

// resolve maps a path written in the file onto indexed element paths: a
// prefix that names an array of tables refers to its latest element.
func (sc *scanner) resolve(parts []string) []string {
	out := make([]string, 0, len(parts))
	for _, part := range parts {
		out = append(out, part)
		if el, ok := sc.current[KeyString(out)]; ok {
			out[len(out)-1] = el
		}
	}
	return out
}

func (sc *scanner) document() {
	var table []string
	for {
		sc.skipSpace()
		if sc.eof() {
			return
		}
		start, line := sc.i, sc.line
		if sc.peek() == '[' {
			array := strings.HasPrefix(sc.s[sc.i:], "[[")
			sc.next()
			if array {
				sc.next()
			}
			sc.level = 0
			k := sc.key()
			if !sc.deeper(len(k)) {
				return
			}
			if array && len(k) > 0 {
				table = append(sc.resolve(k[:len(k)-1]), k[len(k)-1])
				plain := KeyString(table)
				n := sc.count[plain]
				sc.count[plain] = n + 1
				sc.record(plain, line, "")
				table[len(table)-1] += "[" + strconv.Itoa(n) + "]"
				sc.current[plain] = table[len(table)-1]
			} else {
				table = sc.resolve(k)
			}
			sc.recordPrefixes(table, line)
			sc.skipLine()
		} else {
			sc.level = len(table)
			sc.keyValue(table, line, true)
		}
		if sc.i == start {
			sc.next()
		}
	}
}

// recordPrefixes records every prefix of path at line (first sighting wins).
func (sc *scanner) recordPrefixes(path []string, line int) {
	for n := 1; n <= len(path); n++ {
		sc.record(KeyString(path[:n]), line, "")
	}
}

// keyValue reads `key = value` under table and records its position.
func (sc *scanner) keyValue(table []string, line int, record bool) {
	k := sc.key()
	if len(k) == 0 {
		sc.skipLine()
		return
	}
	if !sc.deeper(len(k)) {
		return
	}
	defer func() { sc.level -= len(k) }()
	sc.skipBlank()
	if sc.peek() != '=' {
		sc.skipLine()
		return
	}
	sc.next()
	sc.skipBlank()
	path := append(append([]string{}, table...), k...)
	if record {
		sc.recordPrefixes(path[:len(path)-1], line)
	}
	raw := sc.value(path, record)
	if record {
		// The key itself wins over a prefix recorded for an inline table.
		sc.pos[KeyString(path)] = Pos{Line: line, Raw: raw}
	}
}

// key reads a dotted key and returns its components in written form.
func (sc *scanner) key() []string {
	var parts []string
	for {
		sc.skipBlank()
		var name string
		switch sc.peek() {
		case '"':
			name = unescapeBasic(sc.oneLineString('"'))
		case '\'':
			name = sc.oneLineString('\'')
		default:
			start := sc.i
			for !sc.eof() && isBare(sc.peek()) {
				sc.next()
			}
			if sc.i == start {
				return parts
			}
			name = sc.s[start:sc.i]
		}
		parts = append(parts, Component(name))
		if len(parts) > MaxDepth {
			sc.deeper(len(parts))
			return nil
		}
		sc.skipBlank()
		if sc.peek() != '.' {
			return parts
		}
		sc.next()
	}
}

func isBare(c byte) bool {
	return c >= 'A' && c <= 'Z' || c >= 'a' && c <= 'z' || c >= '0' && c <= '9' || c == '_' || c == '-'
}

// oneLineString reads a one-line string, basic ("...", delim '"', with
// escapes, which the caller undoes) or literal ('...', delim '\”), and
// returns its body.
func (sc *scanner) oneLineString(delim byte) string {
	sc.next()
	start := sc.i
	for !sc.eof() {
		switch c := sc.peek(); {
		case c == '\\' && delim == '"':
			sc.next()
		case c == delim:
			body := sc.s[start:sc.i]
			sc.next()
			return body
		case c == '\n':
			return sc.s[start:sc.i]
		}
		sc.next()
	}
	return sc.s[start:]
}

// multiline skips a multi-line string, basic (three double quotes) or
// literal (three single quotes); delim is the quote character.
func (sc *scanner) multiline(delim byte, escapes bool) {
	fence := strings.Repeat(string(delim), 3)
	sc.next()
	sc.next()
	sc.next()
	for !sc.eof() {
		if escapes && sc.peek() == '\\' {
			sc.next()
			sc.next()
			continue
		}
		if strings.HasPrefix(sc.s[sc.i:], fence) {
			sc.next()
			sc.next()
			sc.next()
			// Up to two quotes may sit just inside the closing fence.
			for n := 0; n < 2 && sc.peek() == delim; n++ {
				sc.next()
			}
			return
		}
		sc.next()
	}
}

// value skips one value, recording the keys of inline tables under path
// when record is set, and returns the value as written (one line, short).
func (sc *scanner) value(path []string, record bool) string {
	start := sc.i
	if c := sc.peek(); c == '[' || c == '{' {
		if !sc.deeper(1) {
			return ""
		}
		defer func() { sc.level-- }()
	}
	switch sc.peek() {
	case '"':
		if strings.HasPrefix(sc.s[sc.i:], `"""`) {
			sc.multiline('"', true)
		} else {
			sc.oneLineString('"')
		}
	case '\'':
		if strings.HasPrefix(sc.s[sc.i:], "'''") {
			sc.multiline('\'', false)
		} else {
			sc.oneLineString('\'')
		}
	case '[':
		// Elements of an array are recorded as path[0], path[1], ... at
		// the line where each starts, so that a problem in one row of
		// canopy.profile or one inline table of an array names its line.
		sc.next()
		for n := 0; !sc.eof(); n++ {
			sc.skipSpace()
			if sc.peek() == ']' {
				sc.next()
				break
			}
			at, line := sc.i, sc.line
			var el []string
			if record && len(path) > 0 {
				el = Indexed(path, n)
			}
			raw := sc.value(el, el != nil)
			if el != nil {
				sc.pos[KeyString(el)] = Pos{Line: line, Raw: raw}
			}
			sc.skipSpace()
			if sc.peek() == ',' {
				sc.next()
			}
			if sc.i == at {
				sc.next()
			}
		}
	case '{':
		sc.next()
		for !sc.eof() {
			sc.skipSpace()
			if sc.peek() == '}' {
				sc.next()
				break
			}
			at := sc.i
			sc.keyValue(path, sc.line, record)
			sc.skipSpace()
			if sc.peek() == ',' {
				sc.next()
			}
			if sc.i == at {
				sc.next()
			}
		}
	default:
		for !sc.eof() && !strings.ContainsRune(",]}#\r\n", rune(sc.peek())) {
			sc.next()
		}
	}
	return shorten(sc.s[start:sc.i])
}

// shorten trims a raw value to its first line and at most 60 bytes.
func shorten(raw string) string {
	raw = strings.TrimSpace(raw)
	cut := false
	if i := strings.IndexAny(raw, "\r\n"); i >= 0 {
		raw, cut = strings.TrimSpace(raw[:i]), true
	}
	if len(raw) > 60 {
		n := 60
		for n > 0 && !utf8.RuneStart(raw[n]) {
			n--
		}
		raw, cut = raw[:n], true
	}
	if cut {
		raw += " …"
	}
	return raw
}

// unescapeBasic undoes the escapes of a TOML basic string body.
func unescapeBasic(s string) string {
	if !strings.Contains(s, `\`) {
		return s
	}
	var b strings.Builder
	for i := 0; i < len(s); i++ {
		c := s[i]
		if c != '\\' || i+1 >= len(s) {
			b.WriteByte(c)
			continue
		}
		i++
		switch s[i] {
		case 'b':
			b.WriteByte('\b')
		case 't':
			b.WriteByte('\t')
		case 'n':
			b.WriteByte('\n')
		case 'f':
			b.WriteByte('\f')
		case 'r':
			b.WriteByte('\r')
		case 'e':
			b.WriteByte(0x1b)
		case 'x', 'u', 'U':
			n := 2
			if s[i] == 'u' {
				n = 4
			} else if s[i] == 'U' {
				n = 8
			}
			if i+1+n <= len(s) {
				if r, err := strconv.ParseUint(s[i+1:i+1+n], 16, 32); err == nil {
					b.WriteRune(rune(r))
					i += n
					continue
				}
			}
			b.WriteByte(s[i])
		default:
			b.WriteByte(s[i])
		}
	}
	return b.String()
}
