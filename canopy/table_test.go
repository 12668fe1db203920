package canopy

import (
	"errors"
	"math"
	"os"
	"path/filepath"
	"slices"
	"strconv"
	"strings"
	"testing"
)

func TestLoadProfileFixture(t *testing.T) {
	p, err := LoadProfile(filepath.Join("testdata", "meadow.csv"))
	if err != nil {
		t.Fatal(err)
	}
	wantZ := []float64{0.02, 0.10, 0.20, 0.25}
	wantA := []float64{6, 8, 5, 0}
	if !slices.Equal(p.Z, wantZ) || !slices.Equal(p.A, wantA) || p.Edge != 0 {
		t.Fatalf("read %+v, want Z %v A %v", p, wantZ, wantA)
	}
	if err := p.Validate(1); err != nil {
		t.Errorf("fixture fails Validate: %v", err)
	}
	// Derived: the taper ends at 0.25 m; 0.02·6 + 0.08·7 + 0.1·6.5 + 0.05·2.5.
	if h := p.Height(); h != 0.25 {
		t.Errorf("Height = %g, want 0.25", h)
	}
	if got := p.FrontalAreaIndex(); !near(got, 0.12+0.56+0.65+0.125, 1e-15) {
		t.Errorf("frontal area index = %g, want 1.455", got)
	}
}

func TestReadProfileForms(t *testing.T) {
	want := Profile{Z: []float64{0.1, 0.2}, A: []float64{3, 1.5}}
	for _, tc := range []struct{ name, text string }{
		{"plain", "0.1,3\n0.2,1.5\n"},
		{"spaces", "  0.1 ,  3 \n\t0.2,\t1.5"},
		{"header", "z [m], a [1/m]\n0.1, 3\n0.2, 1.5\n"},
		{"header no units", "z, a\n0.1, 3\n0.2, 1.5\n"},
		{"header other spelling", "Z [m], A [m^-1]\n0.1, 3\n0.2, 1.5\n"},
		{"comments", "# a comment\n\n  # indented\nz [m], a [1/m] # header\n0.1, 3 # first\n\n0.2, 1.5#tip\n# end\n"},
		{"crlf", "z [m], a [1/m]\r\n0.1, 3\r\n0.2, 1.5\r\n"},
		{"bom", "\ufeffz [m], a [1/m]\n0.1, 3\n0.2, 1.5\n"},
		{"exponents", "1e-1, 3e0\n2E-1, 15e-1\n"},
	} {
		p, err := ReadProfile(strings.NewReader(tc.text))
		if err != nil {
			t.Errorf("%s: %v", tc.name, err)
			continue
		}
		if !slices.Equal(p.Z, want.Z) || !slices.Equal(p.A, want.A) {
			t.Errorf("%s: read Z %v A %v, want %v %v", tc.name, p.Z, p.A, want.Z, want.A)
		}
	}
}

func TestReadProfileErrors(t *testing.T) {
	for _, tc := range []struct {
		name, text string
		line       int
		want       string
	}{
		{"empty", "", 0, "no (z, a) points"},
		{"only comments", "# nothing\n\n", 0, "no (z, a) points"},
		{"only header", "z [m], a [1/m]\n", 0, "no (z, a) points"},
		{"one field", "0.1, 2\n0.2\n", 2, "1 comma-separated fields: need two"},
		{"three fields", "0.1, 2, 7\n", 1, "3 comma-separated fields"},
		{"bad z", "0.1, 2\nabc, 3\n", 2, `z = "abc": not a number`},
		{"bad a", "0.1, 2\n0.2, x\n", 2, `a = "x": not a number`},
		{"bad header", "height, density\n0.1, 2\n", 1, "neither numbers nor the header"},
		{"header twice", "z, a\nz, a\n0.1, 2\n", 2, `z = "z": not a number`},
		{"header late", "0.1, 2\nz [m], a [1/m]\n", 2, `z = "z [m]"`},
		{"cm", "z [cm], a [1/m]\n10, 2\n", 1, "header unit of z is [cm]: need [m]"},
		{"a unit", "z [m], a [1/cm]\n0.1, 2\n", 1, "header unit of a is [1/cm]: need [1/m]"},
		{"brackets", "z [m, a [1/m]\n0.1, 2\n", 1, "neither numbers nor the header"},
		{"zero z twice", "# bed\n0, 2\n0, 3\n", 3, "z = 0 m is not above the previous z = 0 m"},
		{"negative z", "-0.1, 2\n", 1, "z = -0.1 m"},
		{"nan z", "NaN, 2\n", 1, "z = NaN m"},
		{"order", "0.1, 2\n\n0.3, 4\n# c\n0.2, 3\n", 5, "z = 0.2 m is not above the previous z = 0.3 m (line 3)"},
		{"repeat", "0.1, 2\n0.1, 3\n", 2, "heights must increase strictly"},
		{"negative a", "0.1, -2\n", 1, "a = -2 1/m: need a finite density >= 0"},
		{"inf a", "0.1, +Inf\n", 1, "a = +Inf 1/m"},
		{"long line", "0.1, 2\n" + strings.Repeat("9", maxLine+10) + "\n", 2, "longer than"},
	} {
		_, err := ReadProfile(strings.NewReader(tc.text))
		var te *TableError
		switch {
		case err == nil:
			t.Errorf("%s: no error, want line %d %q", tc.name, tc.line, tc.want)
		case !errors.As(err, &te):
			t.Errorf("%s: error %v is not a *TableError", tc.name, err)
		case te.Line != tc.line || !strings.Contains(te.Msg, tc.want):
			t.Errorf("%s: got line %d %q, want line %d containing %q", tc.name, te.Line, te.Msg, tc.line, tc.want)
		}
	}
}

func TestLoadProfileErrors(t *testing.T) {
	path := filepath.Join("testdata", "unsorted.csv")
	_, err := LoadProfile(path)
	if err == nil || !strings.Contains(err.Error(), "canopy: profile "+path+" line 5: z = 0.2 m is not above the previous z = 0.3 m (line 4)") {
		t.Errorf("unsorted fixture: got %v", err)
	}
	_, err = LoadProfile(filepath.Join("testdata", "no-such-file.csv"))
	if !errors.Is(err, os.ErrNotExist) {
		t.Errorf("missing file: got %v, want a not-exist error", err)
	}
}

// formatProfile writes p in the table format with exact round-trip numbers.
func formatProfile(p Profile) string {
	var b strings.Builder
	b.WriteString("z [m], a [1/m]\n")
	for j := range p.Z {
		b.WriteString(strconv.FormatFloat(p.Z[j], 'g', -1, 64))
		b.WriteString(", ")
		b.WriteString(strconv.FormatFloat(p.A[j], 'g', -1, 64))
		b.WriteString("\n")
	}
	return b.String()
}

func FuzzReadProfile(f *testing.F) {
	for _, name := range []string{"meadow.csv", "unsorted.csv"} {
		data, err := os.ReadFile(filepath.Join("testdata", name))
		if err != nil {
			f.Fatal(err)
		}
		f.Add(string(data))
	}
	for _, s := range []string{"", "0.1,2", "z,a\n1,1\n", "#\n", "\ufeff0.5, 1e300\n", "1,\n", ",", "z [m], a [m-1]\n0x1p-3, 2\n"} {
		f.Add(s)
	}
	f.Fuzz(func(t *testing.T, text string) {
		p, err := ReadProfile(strings.NewReader(text))
		if err != nil {
			var te *TableError
			if !errors.As(err, &te) {
				t.Fatalf("error %v is not a *TableError", err)
			}
			return
		}
		// What the reader accepts passes Validate for a domain deep enough.
		if err := p.Validate(math.MaxFloat64); err != nil {
			t.Fatalf("accepted table fails Validate: %v\n%q", err, text)
		}
		if fai := p.FrontalAreaIndex(); math.IsNaN(fai) || fai < 0 {
			t.Fatalf("frontal area index %g", fai)
		}
		// Round trip through the table format.
		q, err := ReadProfile(strings.NewReader(formatProfile(p)))
		if err != nil {
			t.Fatalf("round trip: %v", err)
		}
		if !slices.Equal(p.Z, q.Z) || !slices.Equal(p.A, q.A) {
			t.Fatalf("round trip changed the table: %v %v → %v %v", p.Z, p.A, q.Z, q.A)
		}
	})
}
