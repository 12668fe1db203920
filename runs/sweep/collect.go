package sweep

import (
	"bytes"
	"encoding/csv"
	"encoding/json"
	"errors"
	"fmt"
	"io"
	"os"
	"path/filepath"
	"strconv"

	"rollerbed/io/report"
)

// CSVName is the table `sweep collect` writes into the sweep folder.
const CSVName = "sweep.csv"

// Collection is every member's summary.json gathered into one table.
type Collection struct {
	// Keys are the varied keys; Columns the numeric summary keys,
	// flattened to dotted names (run.steps, flow.penetration_depth_m), in
	// the order summary.json gives them.
	Keys    []string
	Columns []string
	Rows    []Row
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
	numeric := map[string]bool{}
	for i, m := range man.Members {
		row := Row{Index: i, Name: m.Name, Values: m.Values, Numbers: map[string]float64{}}
		runDir := RunDir(dir, m.Name)
		row.State = ReadFolderState(runDir).State
		if row.State == StateDone {
			b, err := os.ReadFile(filepath.Join(runDir, "summary.json"))
			if err != nil {
				return nil, err
			}
			err = flattenJSON(b, func(key string, v any) {
				if !seen[key] {
					seen[key] = true
					order = append(order, key)
				}
				if f, ok := v.(float64); ok {
					row.Numbers[key] = f
					numeric[key] = true
				}
			})
			if err != nil {
				return nil, fmt.Errorf("member %s: summary.json: %w", m.Name, err)
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
		}
	}
	return c, nil
}

// flattenJSON calls emit for every scalar of a JSON document, with its
// dotted key, in document order: numbers as float64, null as nil, strings
// and booleans as themselves. Arrays are skipped.
func flattenJSON(b []byte, emit func(key string, v any)) error {
	dec := json.NewDecoder(bytes.NewReader(b))
	dec.UseNumber()
	var walk func(prefix string) error
	walk = func(prefix string) error {
		tok, err := dec.Token()
		if err != nil {
			return err
		}
		switch t := tok.(type) {
		case json.Delim:
			switch t {
			case '{':
				for dec.More() {
					kt, err := dec.Token()
					if err != nil {
						return err
					}
					k, _ := kt.(string)
					key := k
					if prefix != "" {
						key = prefix + "." + k
					}
					if err := walk(key); err != nil {
						return err
					}
				}
				_, err = dec.Token() // }
				return err
			case '[':
				for dec.More() {
					var skip json.RawMessage
					if err := dec.Decode(&skip); err != nil {
						return err
					}
				}
				_, err = dec.Token() // ]
				return err
			}
		case json.Number:
			f, err := t.Float64()
			if err != nil {
				return fmt.Errorf("%s: %w", prefix, err)
			}
			emit(prefix, f)
		default:
			emit(prefix, t)
		}
		return nil
	}
	if err := walk(""); err != nil {
		return err
	}
	if _, err := dec.Token(); !errors.Is(err, io.EOF) {
		return errors.New("more than one JSON document")
	}
	return nil
}

// Header returns the CSV header: member, the varied keys, the summary
// columns.
func (c *Collection) Header() []string {
	h := append([]string{"member"}, c.Keys...)
	return append(h, c.Columns...)
}

// Records returns the table as CSV records, header first. Numbers are
// written in the shortest form that reads back to the same value; a value
// a member lacks is empty.
func (c *Collection) Records() [][]string {
	out := [][]string{c.Header()}
	for _, r := range c.Rows {
		rec := []string{strconv.Itoa(r.Index)}
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
	var b bytes.Buffer
	w := csv.NewWriter(&b)
	if err := w.WriteAll(c.Records()); err != nil {
		return err
	}
	return report.WriteFileAtomic(path, b.Bytes())
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
