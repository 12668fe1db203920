package report

import (
	"bufio"
	"encoding/json"
	"fmt"
	"os"
	"path/filepath"
	"strconv"
)

// WriteFileAtomic writes data to path through a temporary file in the same
// folder that is synced and renamed over path.
func WriteFileAtomic(path string, data []byte) error {
	dir := filepath.Dir(path)
	f, err := os.CreateTemp(dir, "."+filepath.Base(path)+".tmp-*")
	if err != nil {
		return fmt.Errorf("cannot write in %s: %w", dir, err)
	}
	tmp := f.Name()
	fail := func(err error) error {
		f.Close()
		os.Remove(tmp)
		return fmt.Errorf("writing %s: %w", path, err)
	}
	if _, err := f.Write(data); err != nil {
		return fail(err)
	}
	if err := f.Sync(); err != nil {
		return fail(err)
	}
	if err := f.Close(); err != nil {
		os.Remove(tmp)
		return fmt.Errorf("writing %s: %w", path, err)
	}
	if err := os.Chmod(tmp, 0o644); err != nil {
		os.Remove(tmp)
		return fmt.Errorf("writing %s: %w", path, err)
	}
	if err := os.Rename(tmp, path); err != nil {
		os.Remove(tmp)
		return fmt.Errorf("writing %s: %w", path, err)
	}
	return nil
}

// WriteJSON writes v as indented JSON.
func WriteJSON(path string, v any) error {
	b, err := json.MarshalIndent(v, "", "  ")
	if err != nil {
		return fmt.Errorf("encoding %s: %w", path, err)
	}
	return WriteFileAtomic(path, append(b, '\n'))
}

// Table is a CSV table of equal-length float columns with a header row.
// Header names carry their unit in brackets, e.g. "z [m]".
type Table struct {
	Header  []string
	Columns [][]float64
}

// WriteCSV writes the table with full float64 precision.
func (t Table) WriteCSV(path string) error {
	if len(t.Header) != len(t.Columns) {
		panic("report: table header and columns differ in number")
	}
	n := 0
	if len(t.Columns) > 0 {
		n = len(t.Columns[0])
	}
	for _, c := range t.Columns {
		if len(c) != n {
			panic("report: table columns differ in length")
		}
	}
	var buf bytesBuffer
	w := bufio.NewWriter(&buf)
	for i, h := range t.Header {
		if i > 0 {
			w.WriteByte(',')
		}
		w.WriteString(strconv.Quote(h))
	}
	w.WriteByte('\n')
	for r := 0; r < n; r++ {
		for i, c := range t.Columns {
			if i > 0 {
				w.WriteByte(',')
			}
			w.WriteString(strconv.FormatFloat(c[r], 'g', -1, 64))
		}
		w.WriteByte('\n')
	}
	w.Flush()
	return WriteFileAtomic(path, buf.b)
}

type bytesBuffer struct{ b []byte }

func (b *bytesBuffer) Write(p []byte) (int, error) { b.b = append(b.b, p...); return len(p), nil }
