//go:build !linux

package runs

// physicalMemory is unknown off Linux: no run is refused for its memory.
func physicalMemory() (int64, bool) { return 0, false }
