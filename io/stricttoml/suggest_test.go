package stricttoml

import "testing"

func TestEditDistance(t *testing.T) {
	tests := []struct {
		a, b string
		d    int
	}{
		{"", "", 0}, {"nz", "nz", 0}, {"nzz", "nz", 1}, {"lenght", "length", 1},
		{"depht", "depth", 1}, {"kitten", "sitting", 3}, {"", "abc", 3}, {"NX", "nx", 2},
	}
	for _, tt := range tests {
		if got := editDistance(tt.a, tt.b); got != tt.d {
			t.Errorf("editDistance(%q, %q) = %d, want %d", tt.a, tt.b, got, tt.d)
		}
	}
}

func TestClosest(t *testing.T) {
	keys := []string{"length", "depth", "nx", "nz", "cluster"}
	tests := []struct{ in, want string }{
		{"lenght", "length"}, {"NZ", "nz"}, {"clustr", "cluster"}, {"n", ""}, // n ties nx and nz
		{"width", ""}, {"dept", "depth"}, {"clusters_at", "cluster"}, {"len", "length"}, {"nxx", "nx"},
	}
	for _, tt := range tests {
		if got := Closest(tt.in, keys); got != tt.want {
			t.Errorf("Closest(%q) = %q, want %q", tt.in, got, tt.want)
		}
	}
	// An edit of one character wins over a shared beginning.
	if got := Closest("plate_laminar", []string{"plate", "plate-laminar"}); got != "plate-laminar" {
		t.Errorf("Closest(plate_laminar) = %q, want plate-laminar", got)
	}
	if got := Closest("time", []string{"time_limit", "memory"}); got != "time_limit" {
		t.Errorf("Closest(time) = %q, want time_limit", got)
	}
}
