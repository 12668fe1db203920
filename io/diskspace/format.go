package diskspace

import "fmt"

// Format writes n bytes for people: "512 B", "3.0 KiB", "1.5 MiB",
// "2.1 GiB" (binary prefixes, one decimal).
func Format(n int64) string {
	switch {
	case n >= 1<<30:
		return fmt.Sprintf("%.1f GiB", float64(n)/(1<<30))
	case n >= 1<<20:
		return fmt.Sprintf("%.1f MiB", float64(n)/(1<<20))
	case n >= 1<<10:
		return fmt.Sprintf("%.1f KiB", float64(n)/(1<<10))
	}
	return fmt.Sprintf("%d B", n)
}
