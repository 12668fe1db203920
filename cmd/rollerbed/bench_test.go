package main

import (
	"reflect"
	"strings"
	"testing"
)

func TestParseGrids(t *testing.T) {
	for _, tc := range []struct {
		in   string
		want [][2]int
		bad  bool
	}{
		{in: "512x128", want: [][2]int{{512, 128}}},
		{in: "256x64, 1024x256", want: [][2]int{{256, 64}, {1024, 256}}},
		{in: "512", bad: true},
		{in: "512x", bad: true},
		{in: "511x128", bad: true},
		{in: "4x4", bad: true},
		{in: "512x128x2", bad: true},
		{in: "512x128,", bad: true},
		{in: "512 x 128", bad: true},
	} {
		got, err := parseGrids(tc.in)
		if tc.bad {
			if err == nil {
				t.Errorf("parseGrids(%q) = %v, want an error", tc.in, got)
			} else if !strings.Contains(err.Error(), "--grid") || !strings.Contains(err.Error(), "NXxNZ") {
				t.Errorf("parseGrids(%q): error %q does not name the option and the form", tc.in, err)
			}
			continue
		}
		if err != nil || !reflect.DeepEqual(got, tc.want) {
			t.Errorf("parseGrids(%q) = %v, %v; want %v", tc.in, got, err, tc.want)
		}
	}
}

func FuzzParseGrids(f *testing.F) {
	for _, s := range []string{"512x128", "256x64,1024x256", "x", ",", "8x8"} {
		f.Add(s)
	}
	f.Fuzz(func(t *testing.T, s string) {
		grids, err := parseGrids(s)
		if err != nil {
			return
		}
		for _, g := range grids {
			if g[0] < 8 || g[1] < 8 || g[0]%2 != 0 {
				t.Fatalf("parseGrids(%q) accepted %v", s, g)
			}
		}
	})
}

func TestBenchUsage(t *testing.T) {
	code, _, e := runCmd(t, "bench", "--grid", "12y3")
	if code != exitUsage {
		t.Fatalf("bench --grid 12y3: exit %d, want %d (stderr %q)", code, exitUsage, e)
	}
	if !strings.Contains(e, "12y3") {
		t.Errorf("bench --grid 12y3: stderr %q does not name the value", e)
	}
}
