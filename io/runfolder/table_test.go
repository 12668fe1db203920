package runfolder

import (
	"encoding/csv"
	"os"
	"path/filepath"
	"slices"
	"strconv"
	"strings"
	"testing"
)

func TestTableRoundTrip(t *testing.T) {
	dir := t.TempDir()
	p := filepath.Join(dir, "profile.csv")
	tab := Table{Header: []string{"z [m]", "U [m/s]"}, Columns: [][]float64{{0.1, 0.2}, {1.0 / 3, 2e-17}}}
	if err := tab.WriteCSV(p); err != nil {
		t.Fatal(err)
	}
	f, err := os.Open(p)
	if err != nil {
		t.Fatal(err)
	}
	defer f.Close()
	rows, err := csv.NewReader(f).ReadAll()
	if err != nil {
		t.Fatal(err)
	}
	if len(rows) != 3 || rows[0][0] != "z [m]" || rows[0][1] != "U [m/s]" {
		t.Fatalf("rows %q", rows)
	}
	for r := 1; r < 3; r++ {
		for c := 0; c < 2; c++ {
			v, err := strconv.ParseFloat(rows[r][c], 64)
			if err != nil || v != tab.Columns[c][r-1] {
				t.Fatalf("cell %d,%d = %q, want %v", r, c, rows[r][c], tab.Columns[c][r-1])
			}
		}
	}
}

func TestReadCSVRoundTrip(t *testing.T) {
	p := filepath.Join(t.TempDir(), "t.csv")
	in := Table{Header: []string{"z [m]", "u'w' [m2/s2]"}, Columns: [][]float64{{0.1, 0.2, 0.3}, {1.0 / 3, -2e-17, 5}}}
	if err := in.WriteCSV(p); err != nil {
		t.Fatal(err)
	}
	out, err := ReadCSV(p)
	if err != nil {
		t.Fatal(err)
	}
	if !slices.Equal(out.Header, in.Header) || out.Rows() != 3 {
		t.Fatalf("read back %+v", out)
	}
	c, err := out.Column("u'w'")
	if err != nil || !slices.Equal(c, in.Columns[1]) {
		t.Errorf("column u'w' = %v (%v), want %v exactly", c, err, in.Columns[1])
	}
	if _, err := out.Column("TKE"); err == nil || !strings.Contains(err.Error(), `"z", "u'w'"`) {
		t.Errorf("missing column: %v", err)
	}
}

func TestReadCSVErrors(t *testing.T) {
	dir := t.TempDir()
	write := func(name, text string) string {
		p := filepath.Join(dir, name)
		os.WriteFile(p, []byte(text), 0o644)
		return p
	}
	for _, c := range []struct{ text, want string }{
		{"", "is empty"},
		{"\"a [m]\",\"b [s]\"\n1,x\n", `line 2, column "b [s]": "x" is not a number`},
		{"\"a [m]\",\"b [s]\"\n1,2\n3\n", "cut short"},
	} {
		if _, err := ReadCSV(write("t.csv", c.text)); err == nil || !strings.Contains(err.Error(), c.want) {
			t.Errorf("%q: error %v, want %q", c.text, err, c.want)
		}
	}
	if _, err := ReadCSV(filepath.Join(dir, "none.csv")); err == nil {
		t.Error("read a missing file")
	}
}

func TestColumnName(t *testing.T) {
	for in, want := range map[string]string{
		"U [m/s]": "U", "Courant number": "Courant number",
		"w_0 (x=0 m, z=0.08 m) [m/s]": "w_0 (x=0 m, z=0.08 m)",
	} {
		if got := ColumnName(in); got != want {
			t.Errorf("ColumnName(%q) = %q, want %q", in, got, want)
		}
	}
}
