package runfolder

import (
	"encoding/json"
	"os"
	"path/filepath"
	"testing"
)

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
