package runfolder

import (
	"encoding/csv"
	"encoding/json"
	"os"
	"path/filepath"
	"strconv"
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

func TestWriteJSONReplacesAtomically(t *testing.T) {
	dir := t.TempDir()
	p := filepath.Join(dir, "summary.json")
	for i := range 2 {
		if err := WriteJSON(p, map[string]int{"steps": i}); err != nil {
			t.Fatal(err)
		}
	}
	b, err := os.ReadFile(p)
	if err != nil {
		t.Fatal(err)
	}
	var m map[string]int
	if err := json.Unmarshal(b, &m); err != nil || m["steps"] != 1 {
		t.Fatalf("read back %s (%v)", b, err)
	}
	ents, _ := os.ReadDir(dir)
	if len(ents) != 1 {
		t.Fatalf("left temporary files: %v", ents)
	}
}

func TestWriteIntoReadOnlyFolderFails(t *testing.T) {
	if os.Geteuid() == 0 {
		t.Skip("root ignores folder permissions")
	}
	dir := t.TempDir()
	os.Chmod(dir, 0o555)
	defer os.Chmod(dir, 0o755)
	if err := WriteJSON(filepath.Join(dir, "x.json"), 1); err == nil {
		t.Fatal("wrote into a read-only folder")
	}
}
