package report

import (
	"encoding/csv"
	"errors"
	"fmt"
	"io"
	"os"
	"strconv"
	"strings"
)

// ReadCSV reads a table that Table.WriteCSV wrote: a header row of quoted
// names with their units in brackets, then rows of numbers. Every row must
// have as many cells as the header.
func ReadCSV(path string) (Table, error) {
	f, err := os.Open(path)
	if err != nil {
		return Table{}, err
	}
	defer f.Close()
	r := csv.NewReader(f)
	r.ReuseRecord = true
	head, err := r.Read()
	if errors.Is(err, io.EOF) {
		return Table{}, fmt.Errorf("%s is empty; it should start with a header row of column names", path)
	}
	if err != nil {
		return Table{}, fmt.Errorf("%s: %w", path, err)
	}
	t := Table{Header: append([]string(nil), head...), Columns: make([][]float64, len(head))}
	for line := 2; ; line++ {
		rec, err := r.Read()
		if errors.Is(err, io.EOF) {
			break
		}
		if err != nil {
			return Table{}, fmt.Errorf("%s: %w; the file may be cut short or edited, rebuild it with `rollerbed run --resume`", path, err)
		}
		for i, cell := range rec {
			v, err := strconv.ParseFloat(strings.TrimSpace(cell), 64)
			if err != nil {
				return Table{}, fmt.Errorf("%s line %d, column %q: %q is not a number", path, line, t.Header[i], cell)
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
