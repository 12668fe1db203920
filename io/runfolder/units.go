package runfolder

import (
	"bytes"
	"fmt"
	"io"
	"math"
	"strconv"
	"strings"
	"text/tabwriter"
)

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
		return FormatNumber(x, 6)
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

// FormatNumber prints x to the given significant digits, whole numbers
// in full, and NaN or infinities as "–".
func FormatNumber(x float64, digits int) string {
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

// UnitCell is the unit of an entry as a table shows it: the unit of its
// key, "–" for a dimensionless number, "" for text and yes/no values.
func UnitCell(e Entry) string { return unitCell(e) }
