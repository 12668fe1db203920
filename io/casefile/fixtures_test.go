package casefile

import (
	"errors"
	"flag"
	"os"
	"path/filepath"
	"testing"
)

var update = flag.Bool("update", false, "rewrite the golden files in testdata")

// TestGolden loads each testdata/*.toml that has a .golden file beside it
// and compares the error text, problem by problem, with the golden file.
// Run `go test -run TestGolden -update` to rewrite the golden files after a
// deliberate change of wording, and review the diff.
func TestGolden(t *testing.T) {
	cases, err := filepath.Glob(filepath.Join("testdata", "*.golden"))
	if err != nil || len(cases) == 0 {
		t.Fatalf("no golden files: %v", err)
	}
	for _, golden := range cases {
		path := golden[:len(golden)-len(".golden")] + ".toml"
		t.Run(filepath.Base(path), func(t *testing.T) {
			_, err := Load(path)
			var es *Errors
			if !errors.As(err, &es) {
				t.Fatalf("Load(%s) = %v, want *Errors", path, err)
			}
			got := err.Error() + "\n"
			if *update {
				if err := os.WriteFile(golden, []byte(got), 0o644); err != nil {
					t.Fatal(err)
				}
				return
			}
			want, err := os.ReadFile(golden)
			if err != nil {
				t.Fatal(err)
			}
			if got != string(want) {
				t.Errorf("Load(%s) problems differ from %s\n got:\n%s\nwant:\n%s", path, golden, got, want)
			}
		})
	}
}

func TestGoodFixturesParse(t *testing.T) {
	for _, name := range []string{"channel.toml", "meadow.toml", "scalars.toml"} {
		if _, err := Load(filepath.Join("testdata", name)); err != nil {
			t.Errorf("%s: %v", name, err)
		}
	}
}
