package runfolder

import (
	"bytes"
	"encoding/csv"
	"errors"
	"fmt"
	"io"
	"os"
	"strconv"
	"strings"
)

// Table is a CSV table of equal-length float columns with a header row.
// Header names carry their unit in brackets, e.g. "z [m]".
type Table struct {
	Header  []string
	Columns [][]float64
}

// WriteCSV writes the table atomically with full float64 precision: a
// header row of quoted names, then a row of numbers per sample, each in
// the shortest form that reads back to the same bits. It panics when the
// header and the columns differ in number or the columns in length.
func (t Table) WriteCSV(path string) error {
	if len(t.Header) != len(t.Columns) {
		panic("runfolder: table header and columns differ in number")
	}
	n := t.Rows()
	for _, c := range t.Columns {
		if len(c) != n {
			panic("runfolder: table columns differ in length")
		}
	}
	var b bytes.Buffer
	for i, h := range t.Header {
		if i > 0 {
			b.WriteByte(',')
		}
		b.WriteString(strconv.Quote(h))
	}
	b.WriteByte('\n')
	for r := 0; r < n; r++ {
		for i, c := range t.Columns {
			if i > 0 {
				b.WriteByte(',')
			}
			b.WriteString(strconv.FormatFloat(c[r], 'g', -1, 64))
		}
		b.WriteByte('\n')
	}
	return WriteFileAtomic(path, b.Bytes())
}

// ReadCSV reads a table that Table.WriteCSV wrote: a header row of quoted
// names with their units in brackets, then rows of numbers. Every row must
// have as many cells as the header.
func ReadCSV(path string) (Table, error) {
	return readFile(path, parseCSV)
}

// readFile opens path and parses it; parse errors start with the place
// (" line 3, ...") or with ": ", and get the path in front.
func readFile[T any](path string, parse func(io.Reader) (T, error)) (T, error) {
	f, err := os.Open(path)
	if err != nil {
		var zero T
		return zero, fmt.Errorf("runfolder: %w", err)
	}
	defer f.Close()
	t, err := parse(f)
	if err != nil {
		var zero T
		return zero, fmt.Errorf("runfolder: %s%w", path, err)
	}
	return t, nil
}

// parseCSV reads a table; its errors are readFile's.
func parseCSV(in io.Reader) (Table, error) {
	r := csv.NewReader(in)
	r.ReuseRecord = true
	head, err := r.Read()
	if errors.Is(err, io.EOF) {
		return Table{}, errors.New(" is empty; it should start with a header row of column names")
	}
	if err != nil {
		return Table{}, fmt.Errorf(": %w", err)
	}
	t := Table{Header: append([]string(nil), head...), Columns: make([][]float64, len(head))}
	for line := 2; ; line++ {
		rec, err := r.Read()
		if errors.Is(err, io.EOF) {
			break
		}
		if err != nil {
			return Table{}, fmt.Errorf(": %w; the file may be cut short or edited, rebuild it with `rollerbed run --resume`", err)
		}
		for i, cell := range rec {
			v, err := strconv.ParseFloat(strings.TrimSpace(cell), 64)
			if err != nil {
				return Table{}, fmt.Errorf(" line %d, column %q: %q is not a number", line, t.Header[i], cell)
			}
			t.Columns[i] = append(t.Columns[i], v)
		}
	}
	return t, nil
}

// Rows returns the number of rows of the table.
func (t Table) Rows() int {
	if len(t.Columns) == 0 {
		return 0
	}
	return len(t.Columns[0])
}

// ColumnName returns a header name without its unit: "U [m/s]" gives "U".
func ColumnName(header string) string {
	if i := strings.LastIndex(header, " ["); i >= 0 && strings.HasSuffix(header, "]") {
		return header[:i]
	}
	return header
}

// Column returns the column whose name (the header without its unit, see
// ColumnName) is name, or an error naming the columns there are.
func (t Table) Column(name string) ([]float64, error) {
	for i, h := range t.Header {
		if ColumnName(h) == name {
			return t.Columns[i], nil
		}
	}
	names := make([]string, len(t.Header))
	for i, h := range t.Header {
		names[i] = strconv.Quote(ColumnName(h))
	}
	return nil, fmt.Errorf("the table has no column %q (it has %s)", name, strings.Join(names, ", "))
}
