package sweep

import (
	"errors"
	"os"
	"path/filepath"
	"reflect"
	"strings"
	"testing"

	"rollerbed/runs"
)

// FuzzParse checks that Parse never panics, that every failure is a list
// of one-line problems at lines of the text, and that every sweep it
// accepts parses to the same File again, with consistent axes; small ones
// are also planned, which must not panic either.
func FuzzParse(f *testing.F) {
	files, _ := filepath.Glob(filepath.Join("testdata", "*.toml"))
	more, _ := filepath.Glob(filepath.Join("testdata", "*", "sweep.toml"))
	for _, name := range append(files, more...) {
		text, err := os.ReadFile(name)
		if err != nil {
			f.Fatal(err)
		}
		f.Add(text)
	}
	for _, name := range runs.SweepExamples() {
		ex, _ := runs.SweepExample(name)
		f.Add(ex[name+".toml"])
	}
	for _, s := range []string{
		"base = \"small/base.toml\"\n[[axis]]\nkey = \"canopy.patch[0].start\"\nvalues = [0.1]\n",
		"base = \"small/base.toml\"\ncombine = \"zip\"\naxis = [{ key = \"canopy.height\", values = [0.05, 0.06] }, { key = \"domain.nz\", linear = { from = 16, to = 24, count = 2 } }]\n",
		"base = \"small/base.toml\"\n[[axis]]\nkey = \"output.fields\"\nvalues = [[\"u\"], [\"u\", \"w\"]]\n",
		"base = \"small/base.toml\"\n[[axis]]\nkey = \"canopy.profile\"\nvalues = [[[0.0, 4.0], [0.08, 4.0]], [[0.0, 8.0], [0.08, 0.0]]]\n",
		"base = \"small/base.toml\"\nseeds = [1, 1.5, \"2\", -3, 4]\n[slurm]\nextra = [\"--a\", 3, \"x\", \"#SBATCH --b\", \"--c\\n--d\"]\n",
		"base = \"small/base.toml\"\nreplicates = 2\n[slurm]\nsetup = [\"module load a\", 3, \"b\\nc\"]\nbinary = \"bin/rollerbed\"\n",
		"base = \"small/base.toml\"\n[[axis]]\nkey = \"canopy.height\"\nlog = { from = 1e-300, to = 1e300, count = 3 }\n",
		"base = \"small/base.toml\"\n[[axis]]\nkey = \"domain.nx\"\nlog = { from = 8, to = 4096, count = 10 }\n",
		"base = \"small/base.toml\"\n[[axis]]\nkey = 'canopy.\"height\"'\nvalues = [0.1]\n[axis.linear]\nfrom = 1\n",
		// Nesting beyond stricttoml.MaxDepth, refused before the TOML
		// library parses it.
		"base = \"small/base.toml\"\n[[axis]]\nkey = \"output.fields\"\nvalues = " + strings.Repeat("[", 100000) + strings.Repeat("]", 100000) + "\n",
		"base = \"small/base.toml\"\naxis = " + strings.Repeat("[{ key = ", 20000) + "1" + strings.Repeat("}]", 20000) + "\n",
	} {
		f.Add([]byte(s))
	}
	f.Fuzz(func(t *testing.T, text []byte) {
		path := filepath.Join("testdata", "fuzz.toml")
		sw, err := Parse(text, path)
		if err != nil {
			var es *Errors
			if !errors.As(err, &es) || len(es.Problems) == 0 {
				t.Fatalf("Parse error %v is not a non-empty *Errors", err)
			}
			lines := strings.Count(string(text), "\n") + 1
			for _, p := range es.Problems {
				if p.Msg == "" || p.Line < 0 || p.Line > lines {
					t.Errorf("problem without message or with a bad line (%d lines): %+v", lines, p)
				}
				if strings.ContainsAny(p.Error(), "\r\n") {
					t.Errorf("problem is not one line: %q", p.Error())
				}
			}
			return
		}
		if sw.Text != string(text) {
			t.Fatal("File.Text is not the input")
		}
		for i, a := range sw.Axes {
			if len(a.Values) == 0 {
				t.Fatalf("axis %d has no values", i)
			}
			if sw.Combine == CombineZip && len(a.Values) != len(sw.Axes[0].Values) {
				t.Fatalf("zip axes of unequal length accepted")
			}
		}
		if s := sw.Slurm; s != nil {
			// What the batch script takes as written is one line each,
			// and the binary an absolute path it can quote.
			for _, l := range append(append([]string{}, s.Setup...), s.Extra...) {
				if strings.ContainsAny(l, "\r\n\x00") {
					t.Fatalf("accepted a [slurm] line with a line break: %q", l)
				}
			}
			if s.Binary != "" && (!filepath.IsAbs(s.Binary) || strings.ContainsAny(s.Binary, " \t\r\n'\"\x00")) {
				t.Fatalf("accepted [slurm] binary %q", s.Binary)
			}
		}
		n := sw.size()
		if n < 1 || n > MaxMembers {
			t.Fatalf("accepted a sweep of %d members", n)
		}
		again, err := Parse(text, path)
		if err != nil || !reflect.DeepEqual(sw, again) {
			t.Fatalf("second parse differs: %v", err)
		}
		if n <= 8 {
			pl, err := NewPlan(sw)
			if err == nil && len(pl.Members) != n {
				t.Fatalf("planned %d members, the sweep makes %d", len(pl.Members), n)
			}
		}
	})
}
