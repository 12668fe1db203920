package runfolder

import (
	"bytes"
	"encoding/csv"
	"errors"
	"fmt"
	"io"
	"strconv"
)

// SweepColMember is the first column of sweep.csv: the member's name, its
// index written with four digits as in the sweep folder (members/0003).
const SweepColMember = "member"

// SweepTable is sweep.csv of a sweep folder: a row per member with its
// index (SweepColMember), its varied values as the sweep file gives them,
// and its numeric summary values under their flattened keys (Entry); a cell
// a member lacks is empty.
type SweepTable struct {
	Header []string
	Rows   [][]string
}

// WriteCSV writes the table to path atomically (RFC 4180, quoting only
// where a cell needs it).
func (t SweepTable) WriteCSV(path string) error {
	var b bytes.Buffer
	w := csv.NewWriter(&b)
	if err := w.Write(t.Header); err != nil {
		return err
	}
	if err := w.WriteAll(t.Rows); err != nil {
		return err
	}
	return WriteFileAtomic(path, b.Bytes())
}

// ReadSweepTable reads a table that SweepTable.WriteCSV wrote.
func ReadSweepTable(path string) (SweepTable, error) {
	return readFile(path, parseSweepTable)
}

// parseSweepTable reads sweep.csv; its errors are readFile's.
func parseSweepTable(in io.Reader) (SweepTable, error) {
	recs, err := csv.NewReader(in).ReadAll()
	if err != nil {
		return SweepTable{}, fmt.Errorf(": %w", err)
	}
	if len(recs) == 0 || len(recs[0]) == 0 || recs[0][0] != SweepColMember {
		return SweepTable{}, errors.New(": the first row should be the header, starting with " + strconv.Quote(SweepColMember))
	}
	return SweepTable{Header: recs[0], Rows: recs[1:]}, nil
}

// Number returns the value of the cell of row i in the named column (the
// header without its unit, see ColumnName) and whether it holds a number.
func (t SweepTable) Number(i int, column string) (float64, bool) {
	for j, h := range t.Header {
		if ColumnName(h) == column && j < len(t.Rows[i]) {
			v, err := strconv.ParseFloat(t.Rows[i][j], 64)
			return v, err == nil
		}
	}
	return 0, false
}
