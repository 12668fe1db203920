package runfolder

import (
	"errors"
	"io"
	"math"
	"path/filepath"
)

// Comparison holds the numeric summary values of several runs side by
// side: one row per key that is a number in at least one run.
type Comparison struct {
	// Runs names the runs as the table heads them: the folder names, or
	// the paths as given when two folders share a name.
	Runs []string `json:"runs"`
	// Dirs are the run folders as given.
	Dirs []string `json:"dirs"`
	// Titles are the runs' run.title, "" where there is none.
	Titles []string        `json:"titles"`
	Rows   []ComparisonRow `json:"rows"`
}

// ComparisonRow is one summary key across the runs.
type ComparisonRow struct {
	Key  string `json:"key"`
	Unit string `json:"unit"` // see Unit; "" when dimensionless
	// Values holds the value of each run, nil where the run lacks the key
	// or has null there.
	Values []*float64 `json:"values"`
	// RatioToFirst holds each value divided by the first run's (1 for the
	// first run), nil where either is missing, where the first is zero or
	// round-off (see RoundOff), and for keys that measure round-off.
	RatioToFirst []*float64 `json:"ratio_to_first"`
}

// Compare reads the summary.json of each run folder and lines up every
// numeric key present in any of them, in the order the keys first appear.
func Compare(runDirs []string) (*Comparison, error) {
	if len(runDirs) == 0 {
		return nil, errors.New("runfolder: compare needs at least one run folder")
	}
	c := &Comparison{Dirs: append([]string(nil), runDirs...)}
	summaries := make([]map[string]float64, len(runDirs))
	var keys []string
	seen := map[string]bool{}
	for i, dir := range runDirs {
		es, err := ReadEntries(dir)
		if err != nil {
			return nil, err
		}
		summaries[i] = map[string]float64{}
		title := ""
		for _, e := range es {
			if e.Key == KeyTitle {
				title, _ = e.Value.(string)
			}
			v, ok := e.Number()
			if !ok {
				continue
			}
			summaries[i][e.Key] = v
			if !seen[e.Key] {
				seen[e.Key] = true
				keys = append(keys, e.Key)
			}
		}
		c.Titles = append(c.Titles, title)
	}
	c.Runs = RunLabels(runDirs)
	for _, k := range keys {
		row := ComparisonRow{Key: k, Unit: Unit(k)}
		for i := range runDirs {
			v, ok := summaries[i][k]
			if ok && !math.IsNaN(v) && !math.IsInf(v, 0) {
				row.Values = append(row.Values, &v)
			} else {
				row.Values = append(row.Values, nil)
			}
		}
		c.Rows = append(c.Rows, row)
	}
	ratios(c.Rows)
	return c, nil
}

// RunLabels names runs by their folder names, or by the paths as given when
// two folders share a name.
func RunLabels(dirs []string) []string {
	out := make([]string, len(dirs))
	count := map[string]int{}
	for i, d := range dirs {
		out[i] = filepath.Base(filepath.Clean(d))
		count[out[i]]++
	}
	for i, d := range dirs {
		if count[out[i]] > 1 {
			out[i] = filepath.Clean(d)
		}
	}
	for i := range out {
		out[i] = oneLine(out[i])
	}
	return out
}

// RatioHead is the head of the ratio columns of the comparison table.
const RatioHead = "÷ first"

// WriteTable prints the comparison as an aligned table: the key, its unit,
// then each run's value, and after every run but the first a column
// "÷ first" with its value over the first run's. Missing values print as
// "–"; columns are separated by at least two spaces.
func (c *Comparison) WriteTable(w io.Writer) error {
	head := []string{"key", "unit"}
	for i, r := range c.Runs {
		head = append(head, r)
		if i > 0 {
			head = append(head, RatioHead)
		}
	}
	rows := [][]string{head}
	for _, row := range c.Rows {
		unit := row.Unit
		if unit == "" {
			unit = missing
		}
		cells := []string{row.Key, unit}
		for i, v := range row.Values {
			cells = append(cells, numberCell(v, 6))
			if i > 0 {
				cells = append(cells, numberCell(row.RatioToFirst[i], 4))
			}
		}
		rows = append(rows, cells)
	}
	return writeAligned(w, rows)
}

func numberCell(v *float64, digits int) string {
	if v == nil {
		return missing
	}
	return FormatNumber(*v, digits)
}
