package livepage

import "testing"

// BenchmarkEncode times the making of one message from a view of a
// 256 × 96 slice with a vorticity map.
func BenchmarkEncode(b *testing.B) {
	v := testView(1)
	for b.Loop() {
		if _, err := encode(v, history{}); err != nil {
			b.Fatal(err)
		}
	}
}
