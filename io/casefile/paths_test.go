package casefile

import (
	"path/filepath"
	"reflect"
	"testing"
)

func TestFileKeys(t *testing.T) {
	if got, want := FileKeys(), []string{"canopy.profile_file"}; !reflect.DeepEqual(got, want) {
		t.Errorf("FileKeys() = %q, want %q", got, want)
	}
}

func TestResolvePath(t *testing.T) {
	abs := filepath.Join(string(filepath.Separator), "data", "meadow.csv")
	for _, tc := range []struct{ name, dir, want string }{
		{"meadow.csv", "cases", filepath.Join("cases", "meadow.csv")},
		{"../profiles/meadow.csv", "cases/a", filepath.Join("cases", "profiles", "meadow.csv")},
		{abs, "cases", abs},
		{"meadow.csv", "", "meadow.csv"},
		{"", "cases", ""},
	} {
		if got := ResolvePath(tc.name, tc.dir); got != tc.want {
			t.Errorf("ResolvePath(%q, %q) = %q, want %q", tc.name, tc.dir, got, tc.want)
		}
	}
}
