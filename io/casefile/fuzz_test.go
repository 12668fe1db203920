package casefile

import (
	"errors"
	"os"
	"path/filepath"
	"reflect"
	"strings"
	"testing"
)

// FuzzParse checks that Parse never panics, that every failure is a list
// of one-line problems, and that every case it accepts validates again and
// parses to the same Case a second time.
func FuzzParse(f *testing.F) {
	files, _ := filepath.Glob(filepath.Join("testdata", "*.toml"))
	for _, name := range files {
		text, err := os.ReadFile(name)
		if err != nil {
			f.Fatal(err)
		}
		f.Add(text)
	}
	f.Add([]byte(Template()))
	text, _ := build(nil)
	f.Add([]byte(text))
	f.Fuzz(func(t *testing.T, text []byte) {
		c, err := Parse(text)
		if err != nil {
			var es *Errors
			if !errors.As(err, &es) || len(es.Problems) == 0 {
				t.Fatalf("Parse error %v is not a non-empty *Errors", err)
			}
			for _, p := range es.Problems {
				if p.Msg == "" || p.Line < 0 {
					t.Errorf("problem without message or with a bad line: %+v", p)
				}
				if strings.ContainsAny(p.Error(), "\r\n") {
					t.Errorf("problem is not one line: %q", p.Error())
				}
			}
			return
		}
		if c.Text != string(text) {
			t.Fatal("Case.Text is not the input")
		}
		if err := c.Validate(); err != nil {
			t.Fatalf("parsed case does not validate:\n%v\ninput:\n%s", err, text)
		}
		again, err := Parse(text)
		if err != nil || !reflect.DeepEqual(c, again) {
			t.Fatalf("second parse differs: %v", err)
		}
	})
}
