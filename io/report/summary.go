package report

import (
	"bytes"
	"encoding/json"
	"errors"
	"fmt"
	"io"
	"math"
	"os"
	"path/filepath"
	"strconv"
	"strings"
	"text/tabwriter"
)

// Entry is one value of summary.json under its flattened key: the names of
// the nested objects joined by dots, e.g. "flow.bulk_velocity_m_s" or
// "scalars.oxygen.total_uptake_per_bed_area". Array elements get their
// index in brackets, e.g. "probes.z_m[0]".
type Entry struct {
	Key string
	// Value is a float64 for a JSON number, a string, a bool, or nil for
	// JSON null (a metric that does not apply to the run).
	Value any
}

// Number returns the value of a numeric entry and whether it is one.
func (e Entry) Number() (float64, bool) {
	v, ok := e.Value.(float64)
	return v, ok
}

// FlattenJSON flattens a JSON object into entries in the order of the
// text, so that every nested object, however deep, becomes dotted keys.
func FlattenJSON(data []byte) ([]Entry, error) {
	dec := json.NewDecoder(bytes.NewReader(data))
	dec.UseNumber()
	tok, err := dec.Token()
	if err != nil {
		return nil, fmt.Errorf("not JSON: %w", err)
	}
	if d, ok := tok.(json.Delim); !ok || d != '{' {
		return nil, errors.New("not a JSON object: the text should start with '{'")
	}
	var out []Entry
	if err := flattenObject(dec, "", &out); err != nil {
		return nil, err
	}
	if _, err := dec.Token(); !errors.Is(err, io.EOF) {
		return nil, errors.New("text after the end of the JSON object")
	}
	return out, nil
}

func flattenObject(dec *json.Decoder, prefix string, out *[]Entry) error {
	for dec.More() {
		tok, err := dec.Token()
		if err != nil {
			return fmt.Errorf("bad JSON after %q: %w", prefix, err)
		}
		key, _ := tok.(string)
		if prefix != "" {
			key = prefix + "." + key
		}
		if err := flattenValue(dec, key, out); err != nil {
			return err
		}
	}
	_, err := dec.Token() // '}'
	return err
}

func flattenValue(dec *json.Decoder, key string, out *[]Entry) error {
	tok, err := dec.Token()
	if err != nil {
		return fmt.Errorf("bad JSON at %q: %w", key, err)
	}
	switch v := tok.(type) {
	case json.Delim:
		switch v {
		case '{':
			return flattenObject(dec, key, out)
		case '[':
			for i := 0; dec.More(); i++ {
				if err := flattenValue(dec, key+"["+strconv.Itoa(i)+"]", out); err != nil {
					return err
				}
			}
			_, err := dec.Token() // ']'
			return err
		}
		return fmt.Errorf("bad JSON at %q: unexpected %v", key, v)
	case json.Number:
		f, err := v.Float64()
		if err != nil {
			return fmt.Errorf("%q: %v is not a float64 number", key, v)
		}
		*out = append(*out, Entry{key, f})
	default: // string, bool, nil
		*out = append(*out, Entry{key, v})
	}
	return nil
}

// ReadSummary reads and flattens the summary.json of the run folder
// runDir.
func ReadSummary(runDir string) ([]Entry, error) {
	if err := CheckRunDir(runDir); err != nil {
		return nil, err
	}
	path := filepath.Join(runDir, "summary.json")
	data, err := os.ReadFile(path)
	if errors.Is(err, os.ErrNotExist) {
		return nil, fmt.Errorf("%s has no summary.json: the run has not written its results yet (it may still be running, or have been killed before its end); continue it with `rollerbed run --resume %s`, which writes summary.json when it stops", runDir, runDir)
	}
	if err != nil {
		return nil, fmt.Errorf("cannot read %s: %w", path, err)
	}
	es, err := FlattenJSON(data)
	if err != nil {
		return nil, fmt.Errorf("%s: %v; the file is damaged: rebuild it by resuming the run (`rollerbed run --resume %s`)", path, err, runDir)
	}
	return es, nil
}

// runMarkers are files that every run folder holds from its first moments.
var runMarkers = []string{"case.toml", "run.log", "summary.json"}

// CheckRunDir returns an error unless dir is a folder that a run wrote: it
// must hold at least one of case.toml, run.log and summary.json.
func CheckRunDir(dir string) error {
	st, err := os.Stat(dir)
	if err != nil {
		return fmt.Errorf("run folder %s: %w; give the folder that `rollerbed run --out DIR` wrote", dir, errors.Unwrap(err))
	}
	if !st.IsDir() {
		return fmt.Errorf("%s is a file, not a run folder; give the folder that `rollerbed run --out DIR` wrote", dir)
	}
	for _, m := range runMarkers {
		if _, err := os.Stat(filepath.Join(dir, m)); err == nil {
			return nil
		}
	}
	return fmt.Errorf("%s is not a run folder: it holds none of %s; give the folder that `rollerbed run --out DIR` wrote", dir, strings.Join(runMarkers, ", "))
}

// unitTokens are the unit words that may end a summary key, with how they
// print.
var unitTokens = map[string]string{
	"1": "1", "m": "m", "m2": "m²", "m3": "m³", "s": "s", "s2": "s²", "s3": "s³",
	"kg": "kg", "mol": "mol", "mmol": "mmol", "umol": "µmol", "hz": "Hz", "pa": "Pa",
}

// Unit returns the SI unit that the suffix of a summary key names, or "" for
// a dimensionless number or a key without a unit suffix. The rule: the key's
// last words (separated by '_') that are unit words form the unit, the first
// of them over the product of the others, so "bulk_velocity_m_s" is m/s,
// "pressure_gradient_m_s2" is m/s², "eddy_diffusivity_m2_s" is m²/s,
// "uptake_mol_m2_s" is mol/(m²·s) and "rate_1_s" is 1/s. The unit words are
// 1, m, m2, m3, s, s2, s3, kg, mol, mmol, umol, hz and pa. A key made of
// unit words only has no unit.
func Unit(key string) string {
	if i := strings.LastIndexByte(key, '.'); i >= 0 {
		key = key[i+1:]
	}
	if i := strings.IndexByte(key, '['); i >= 0 {
		key = key[:i]
	}
	words := strings.Split(strings.ToLower(key), "_")
	k := len(words)
	for k > 1 && unitTokens[words[k-1]] != "" {
		k--
	}
	if k == len(words) || k == 1 && unitTokens[words[0]] != "" {
		return ""
	}
	u := words[k:]
	num := unitTokens[u[0]]
	if len(u) == 1 {
		return num
	}
	den := make([]string, len(u)-1)
	for i, w := range u[1:] {
		den[i] = unitTokens[w]
	}
	if len(den) == 1 {
		return num + "/" + den[0]
	}
	return num + "/(" + strings.Join(den, "·") + ")"
}

// missing is how a table shows a value that is absent or null.
const missing = "–"

// FormatValue prints a summary value for a table: whole numbers in full,
// other numbers to 6 significant digits, nil (JSON null) and non-finite
// numbers as "–".
func FormatValue(v any) string {
	switch x := v.(type) {
	case nil:
		return missing
	case float64:
		return formatNumber(x, 6)
	case bool:
		if x {
			return "yes"
		}
		return "no"
	case string:
		if x == "" {
			return missing
		}
		return oneLine(x)
	}
	return fmt.Sprint(v)
}

func formatNumber(x float64, digits int) string {
	switch {
	case math.IsNaN(x) || math.IsInf(x, 0):
		return missing
	case x == math.Trunc(x) && math.Abs(x) < 1e15:
		return strconv.FormatFloat(x, 'f', 0, 64)
	}
	return strconv.FormatFloat(x, 'g', digits, 64)
}

// oneLine keeps table cells on one line.
func oneLine(s string) string {
	return strings.Join(strings.Fields(s), " ")
}

// unitCell is the unit column of a table: "–" for a dimensionless number,
// empty for text.
func unitCell(e Entry) string {
	if _, text := e.Value.(string); text {
		return ""
	}
	if _, yes := e.Value.(bool); yes {
		return ""
	}
	if u := Unit(e.Key); u != "" {
		return u
	}
	return missing
}

// WriteSummaryTable prints the entries as an aligned table of three
// columns, key, value and unit, under a header row; null values show as
// "–", and the unit of a dimensionless number as "–".
func WriteSummaryTable(w io.Writer, entries []Entry) error {
	rows := [][]string{{"key", "value", "unit"}}
	for _, e := range entries {
		rows = append(rows, []string{e.Key, FormatValue(e.Value), unitCell(e)})
	}
	return writeAligned(w, rows)
}

// writeAligned prints rows of cells in columns padded to at least two
// spaces apart, without trailing blanks.
func writeAligned(w io.Writer, rows [][]string) error {
	var buf bytes.Buffer
	tw := tabwriter.NewWriter(&buf, 0, 4, 2, ' ', 0)
	for _, r := range rows {
		fmt.Fprintln(tw, strings.Join(r, "\t"))
	}
	tw.Flush()
	var out strings.Builder
	for _, l := range strings.SplitAfter(buf.String(), "\n") {
		if l == "" {
			continue
		}
		out.WriteString(strings.TrimRight(l, " \n") + "\n")
	}
	_, err := io.WriteString(w, out.String())
	return err
}
