package sweep

import (
	"fmt"
	"strconv"

	"rollerbed/io/runfolder"
)

// CSVName is the table `sweep collect` writes into the sweep folder.
const CSVName = runfolder.SweepTableFile

// Collection is every member's summary.json gathered into one table.
type Collection struct {
	// Keys are the varied keys; Columns the numeric summary keys,
	// flattened to dotted names (run.steps, flow.penetration_depth_m), in
	// the order summary.json gives them.
	Keys    []string
	Columns []string
	// Empty are the summary keys that are null in every done member (a
	// metric the runs could not give).
	Empty []string
	Rows  []Row
	// Missing lists the members without a finished summary (not done
	// yet, or failed); their rows hold only the varied values.
	Missing []int
	man     *Manifest
	dir     string
}

// Row is one member in a Collection.
type Row struct {
	Index  int
	Name   string
	State  State
	Values []Value
	// Numbers holds the member's numeric summary values; a key missing
	// here is null in its summary or not there at all.
	Numbers map[string]float64
}

// Collect gathers the summary.json of every done member of the sweep
// folder dir. It fails when no member is done.
func Collect(dir string) (*Collection, error) {
	man, err := ReadManifest(dir)
	if err != nil {
		return nil, err
	}
	c := &Collection{Keys: man.Keys, man: man, dir: dir}
	var order []string
	seen := map[string]bool{}
	numeric, seenText := map[string]bool{}, map[string]bool{}
	for i, m := range man.Members {
		row := Row{Index: i, Name: m.Name, Values: m.Values, Numbers: map[string]float64{}}
		runDir := RunDir(dir, m.Name)
		row.State = ReadFolderState(runDir).State
		if row.State == StateDone {
			es, err := runfolder.ReadEntries(runDir)
			if err != nil {
				return nil, fmt.Errorf("member %s: %w", m.Name, err)
			}
			for _, e := range es {
				if !seen[e.Key] {
					seen[e.Key] = true
					order = append(order, e.Key)
				}
				if f, ok := e.Number(); ok {
					row.Numbers[e.Key] = f
					numeric[e.Key] = true
				} else if e.Value != nil {
					seenText[e.Key] = true
				}
			}
		} else {
			c.Missing = append(c.Missing, i)
		}
		c.Rows = append(c.Rows, row)
	}
	if len(c.Missing) == len(man.Members) {
		return nil, fmt.Errorf("no member of %s is done yet; see `rollerbed sweep status %s`", dir, dir)
	}
	for _, k := range order {
		if numeric[k] {
			c.Columns = append(c.Columns, k)
		} else if !seenText[k] {
			c.Empty = append(c.Empty, k)
		}
	}
	return c, nil
}

// Header returns the CSV header: member, the varied keys, the summary
// columns, each summary key followed by its unit in brackets as in the
// run folder's other tables ("flow.penetration_depth_m [m]"; the name
// without the brackets, runfolder.ColumnName, is the key).
func (c *Collection) Header() []string {
	h := append([]string{runfolder.SweepColMember}, c.Keys...)
	for _, k := range c.Columns {
		if u := runfolder.Unit(k); u != "" && u != "–" {
			k += " [" + u + "]"
		}
		h = append(h, k)
	}
	return h
}

// Records returns the table as CSV records, header first. Numbers are
// written in the shortest form that reads back to the same value; a value
// a member lacks is empty.
func (c *Collection) Records() [][]string {
	out := [][]string{c.Header()}
	for _, r := range c.Rows {
		rec := []string{r.Name}
		byKey := map[string]Value{}
		for _, v := range r.Values {
			byKey[v.Key] = v
		}
		for _, k := range c.Keys {
			rec = append(rec, csvValue(byKey[k]))
		}
		for _, k := range c.Columns {
			if f, ok := r.Numbers[k]; ok {
				rec = append(rec, strconv.FormatFloat(f, 'g', -1, 64))
			} else {
				rec = append(rec, "")
			}
		}
		out = append(out, rec)
	}
	return out
}

// csvValue writes a varied value for the table: strings without quotes,
// everything else as the sweep file would write it.
func csvValue(v Value) string {
	if s, ok := v.Value.(string); ok {
		return s
	}
	return v.Text
}

// WriteCSV writes the table to path atomically.
func (c *Collection) WriteCSV(path string) error {
	recs := c.Records()
	return runfolder.SweepTable{Header: recs[0], Rows: recs[1:]}.WriteCSV(path)
}

// Column returns the values of a varied key or summary column for every
// row, and whether each row has one. Varied values that are not numbers
// count as missing.
func (c *Collection) Column(key string) ([]float64, []bool) {
	vals := make([]float64, len(c.Rows))
	ok := make([]bool, len(c.Rows))
	for i, r := range c.Rows {
		if f, has := r.Numbers[key]; has {
			vals[i], ok[i] = f, true
			continue
		}
		for _, v := range r.Values {
			if v.Key != key {
				continue
			}
			switch x := v.Value.(type) {
			case float64:
				vals[i], ok[i] = x, true
			case int64:
				vals[i], ok[i] = float64(x), true
			}
		}
	}
	return vals, ok
}

// has reports whether key is a varied key or a summary column.
func (c *Collection) has(key string) bool {
	return contains(c.Keys, key) || contains(c.Columns, key)
}
