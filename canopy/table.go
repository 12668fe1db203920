package canopy

import (
	"bufio"
	"errors"
	"fmt"
	"io"
	"math"
	"os"
	"strconv"
	"strings"
	"unicode/utf8"
)

// TableError is a mistake in a profile table, with the line it is on.
type TableError struct {
	File string // the file name as given to LoadProfile; "" for ReadProfile
	Line int    // 1-based line number; 0 for the table as a whole
	Msg  string // what is wrong and how to fix it
}

// Error formats the mistake as "canopy: profile FILE line N: MSG".
func (e *TableError) Error() string {
	var b strings.Builder
	b.WriteString("canopy: profile")
	if e.File != "" {
		b.WriteString(" ")
		b.WriteString(e.File)
	}
	if e.Line > 0 {
		fmt.Fprintf(&b, " line %d", e.Line)
	}
	b.WriteString(": ")
	b.WriteString(e.Msg)
	return b.String()
}

// maxLine is the longest line ReadProfile accepts, in bytes.
const maxLine = 1 << 16

// ReadProfile reads a profile table: one point per line as "z, a" with z in
// m and a in 1/m, separated by a comma, optionally after one header line:
//
//	# comments run from # to the end of the line
//	z [m], a [1/m]
//	0.02, 6.0
//	0.10, 8.0   # linear in between
//
// The bracketed units of the header are optional but, if given, must be m
// and 1/m. Blank lines are skipped. Heights must be finite, at or above
// the bed (z >= 0) and strictly increasing, densities finite and >= 0; the depth
// limit is checked later by Profile.Validate. Mistakes come back as a
// *TableError naming the line. The profile has a sharp top; set Edge to
// smooth it.
func ReadProfile(r io.Reader) (Profile, error) {
	return readProfile(r, "")
}

// maxTableBytes is the largest profile file LoadProfile reads: a table of
// heights has hundreds of lines, not millions.
const maxTableBytes = 16 << 20

// LoadProfile reads the profile table in the named file; see ReadProfile.
// It refuses, without opening it, a path that is not a regular file (a
// folder, a named pipe that would block, a device) and a file larger than
// maxTableBytes.
func LoadProfile(path string) (Profile, error) {
	st, err := os.Stat(path)
	if err != nil {
		return Profile{}, fmt.Errorf("canopy profile: %w", err)
	}
	if !st.Mode().IsRegular() {
		return Profile{}, &TableError{File: path, Msg: fmt.Sprintf("is %s, not a file; name a CSV file of rows z, a (m, 1/m)", fileKind(st.Mode()))}
	}
	if st.Size() > maxTableBytes {
		return Profile{}, &TableError{File: path, Msg: fmt.Sprintf("is %d bytes, more than the %d a profile table may have; is this a profile table of rows z, a?", st.Size(), maxTableBytes)}
	}
	f, err := os.Open(path)
	if err != nil {
		return Profile{}, fmt.Errorf("canopy: profile: %w", err)
	}
	defer f.Close()
	return readProfile(f, path)
}

// fileKind names what a non-regular file is, for messages.
func fileKind(m os.FileMode) string {
	switch {
	case m.IsDir():
		return "a folder"
	case m&os.ModeNamedPipe != 0:
		return "a named pipe"
	case m&os.ModeSocket != 0:
		return "a socket"
	case m&os.ModeDevice != 0:
		return "a device"
	}
	return "not a regular file"
}

// quoteShort quotes s for a message, cut to at most 40 characters.
func quoteShort(s string) string {
	const most = 40
	if r := []rune(s); len(r) > most {
		return strconv.Quote(string(r[:most])) + "…"
	}
	return strconv.Quote(s)
}

func readProfile(r io.Reader, file string) (Profile, error) {
	fail := func(line int, format string, args ...any) (Profile, error) {
		return Profile{}, &TableError{File: file, Line: line, Msg: fmt.Sprintf(format, args...)}
	}
	sc := bufio.NewScanner(r)
	sc.Buffer(make([]byte, 0, 4096), maxLine)
	var p Profile
	line, prevLine := 0, 0
	seen := false // a header or data line has been read
	for sc.Scan() {
		line++
		text := sc.Text()
		if line == 1 {
			text = strings.TrimPrefix(text, "\ufeff")
		}
		if strings.IndexByte(text, 0) >= 0 || !utf8.ValidString(text) {
			return fail(line, "holds binary data, not text; name a CSV file of rows z, a (m, 1/m)")
		}
		if i := strings.IndexByte(text, '#'); i >= 0 {
			text = text[:i]
		}
		text = strings.TrimSpace(text)
		if text == "" {
			continue
		}
		fields := strings.Split(text, ",")
		if len(fields) != 2 {
			return fail(line, "%d comma-separated fields: need two, z [m] and a [1/m]", len(fields))
		}
		zs, as := strings.TrimSpace(fields[0]), strings.TrimSpace(fields[1])
		z, zerr := strconv.ParseFloat(zs, 64)
		if zerr != nil && !seen {
			if msg := checkHeader(zs, as); msg != "" {
				return fail(line, "%s", msg)
			}
			seen = true
			continue
		}
		seen = true
		if zerr != nil {
			return fail(line, "z = %s: not a number; write the height in m", quoteShort(zs))
		}
		a, aerr := strconv.ParseFloat(as, 64)
		if aerr != nil {
			return fail(line, "a = %s: not a number; write the density in 1/m", quoteShort(as))
		}
		switch n := len(p.Z); {
		case math.IsNaN(z) || math.IsInf(z, 0) || z < 0:
			return fail(line, "z = %g m: need a finite height at or above the bed, z >= 0 (heights count from 0 at the bed; a table that starts above it holds its first a down to the bed)", z)
		case n > 0 && !(z > p.Z[n-1]):
			return fail(line, "z = %g m is not above the previous z = %g m (line %d): heights must increase strictly", z, p.Z[n-1], prevLine)
		case math.IsNaN(a) || math.IsInf(a, 0) || a < 0:
			return fail(line, "a = %g 1/m: need a finite density >= 0", a)
		}
		p.Z = append(p.Z, z)
		p.A = append(p.A, a)
		prevLine = line
	}
	if err := sc.Err(); err != nil {
		if errors.Is(err, bufio.ErrTooLong) {
			return fail(line+1, "longer than %d bytes: is this a profile table?", maxLine)
		}
		return Profile{}, fmt.Errorf("canopy: profile %s: %w", file, err)
	}
	if len(p.Z) == 0 {
		return fail(0, "no (z, a) points: need at least one line \"z, a\" with z in m and a in 1/m")
	}
	return p, nil
}

// checkHeader returns "" when the two fields make a header "z [m], a [1/m]"
// (units optional), else what is wrong with them.
func checkHeader(zs, as string) string {
	zName, zUnit, zOK := splitUnit(zs)
	aName, aUnit, aOK := splitUnit(as)
	switch {
	case !zOK || !aOK || !strings.EqualFold(zName, "z") || !strings.EqualFold(aName, "a"):
		return fmt.Sprintf("%s, %s: neither numbers nor the header \"z [m], a [1/m]\"; write z in m and a in 1/m", quoteShort(zs), quoteShort(as))
	case zUnit != "" && zUnit != "m":
		return fmt.Sprintf("header unit of z is [%s]: need [m]; convert the heights to metres", strings.Trim(quoteShort(zUnit), `"`))
	case aUnit != "" && !isPerMetre(aUnit):
		return fmt.Sprintf("header unit of a is [%s]: need [1/m] (frontal area per unit volume); convert the densities", strings.Trim(quoteShort(aUnit), `"`))
	}
	return ""
}

// splitUnit splits "name [unit]" into name and unit; ok is false when the
// brackets are malformed.
func splitUnit(s string) (name, unit string, ok bool) {
	i := strings.IndexByte(s, '[')
	if i < 0 {
		return s, "", !strings.ContainsRune(s, ']')
	}
	j := strings.IndexByte(s, ']')
	if j < i || strings.TrimSpace(s[j+1:]) != "" {
		return s, "", false
	}
	return strings.TrimSpace(s[:i]), strings.TrimSpace(s[i+1 : j]), true
}

func isPerMetre(u string) bool {
	switch strings.ReplaceAll(u, " ", "") {
	case "1/m", "m^-1", "m-1", "m⁻¹", "m2/m3", "m^2/m^3", "m²/m³":
		return true
	}
	return false
}
