package casefile

import (
	"reflect"
	"sort"
	"strconv"
	"strings"
	"time"
)

// field is one key of the schema: a tagged field of a section struct.
type field struct {
	name  string // the TOML key, as in the toml tag
	index int    // field index in the struct
	// table is set for a struct or a pointer to one, written as a
	// [table], and for a slice of structs, written as [[table]] elements.
	table bool
	array bool   // the field is a slice of structs: an array of tables
	row   string // for a slice of number arrays, how a row reads ("[z, a]"), from the row tag
}

// fieldsOf lists the keys of a struct type from its toml tags, in field
// order. Fields tagged "-" or without a tag are not part of the schema.
func fieldsOf(t reflect.Type) []field {
	var fs []field
	for i := 0; i < t.NumField(); i++ {
		f := t.Field(i)
		name, _, _ := strings.Cut(f.Tag.Get("toml"), ",")
		if name == "" || name == "-" || !f.IsExported() {
			continue
		}
		_, table, array := tableType(f.Type)
		fs = append(fs, field{name: name, index: i, table: table, array: array, row: f.Tag.Get("row")})
	}
	return fs
}

// tableType returns the struct type behind a field written as a table (a
// struct, or a pointer to one for an optional table) or as an array of
// tables (a slice of structs), and which of the two it is.
func tableType(t reflect.Type) (st reflect.Type, table, array bool) {
	switch {
	case t.Kind() == reflect.Struct:
		return t, true, false
	case t.Kind() == reflect.Pointer && t.Elem().Kind() == reflect.Struct:
		return t.Elem(), true, false
	case t.Kind() == reflect.Slice && t.Elem().Kind() == reflect.Struct:
		return t.Elem(), true, true
	}
	return nil, false, false
}

// schemaKey is one dotted key of the whole schema.
type schemaKey struct {
	key   string // dotted key, e.g. "domain.cluster.bed"
	name  string // last component
	table bool
}

// schemaKeys lists every key of the schema under t, tables before the keys
// they hold, in field order.
func schemaKeys(t reflect.Type, prefix []string) []schemaKey {
	var out []schemaKey
	for _, f := range fieldsOf(t) {
		path := append(append([]string{}, prefix...), component(f.name))
		out = append(out, schemaKey{key: keyString(path), name: f.name, table: f.table})
		if st, table, _ := tableType(t.Field(f.index).Type); table {
			out = append(out, schemaKeys(st, path)...)
		}
	}
	return out
}

var caseSchema = schemaKeys(reflect.TypeOf(Case{}), nil)

// decodeTable fills the struct rv from the TOML table m, whose dotted path
// is prefix. It records which keys the text holds, and a problem for each
// value of the wrong type and each key the schema does not know.
func decodeTable(m map[string]any, prefix []string, rv reflect.Value, p *problems) {
	fs := fieldsOf(rv.Type())
	known := map[string]bool{}
	for _, f := range fs {
		known[f.name] = true
		v, ok := m[f.name]
		if !ok {
			continue
		}
		path := append(append([]string{}, prefix...), component(f.name))
		key := keyString(path)
		p.given[key] = true
		decodeValue(v, path, key, f, rv.Field(f.index), p)
	}
	var unknown []string
	for name := range m {
		if !known[name] {
			unknown = append(unknown, name)
		}
	}
	sort.Strings(unknown)
	for _, name := range unknown {
		p.unknownKey(prefix, name, m[name], fs)
	}
}

// decodeValue stores the TOML value v of the schema key f into dst, or
// records a type problem.
func decodeValue(v any, path []string, key string, f field, dst reflect.Value, p *problems) {
	name := f.name
	switch dst.Kind() {
	case reflect.Struct:
		if sub, ok := v.(map[string]any); ok {
			decodeTable(sub, path, dst, p)
			return
		}
		p.add(key, "", "must be a table, not "+tomlType(v)+"; write it as a ["+key+"] section with its keys below")
	case reflect.Pointer:
		if dst.Type().Elem().Kind() != reflect.Struct {
			p.add(key, "", noDecoder)
			return
		}
		sub, ok := v.(map[string]any)
		if !ok {
			p.add(key, "", "must be a table, not "+tomlType(v)+"; write it as a ["+key+"] section with its keys below")
			return
		}
		if dst.IsNil() {
			dst.Set(reflect.New(dst.Type().Elem()))
		}
		decodeTable(sub, path, dst.Elem(), p)
	case reflect.Slice:
		switch el := dst.Type().Elem(); {
		case el.Kind() == reflect.Struct:
			decodeTables(v, path, key, dst, p)
		case el.Kind() == reflect.Array && el.Elem().Kind() == reflect.Float64:
			decodeRows(v, path, key, f, dst, p)
		case el.Kind() == reflect.String:
			decodeStrings(v, path, key, f, dst, p)
		default:
			p.add(key, "", noDecoder)
		}
	case reflect.Float64:
		switch x := v.(type) {
		case float64:
			dst.SetFloat(x)
			return
		case int64:
			dst.SetFloat(float64(x))
			return
		}
		p.typeProblem(key, name, v, "a number", numberHint(name, v))
	case reflect.Int, reflect.Int64:
		switch x := v.(type) {
		case int64:
			if dst.OverflowInt(x) {
				p.add(key, fmtInt(x), "is too large an integer")
				return
			}
			dst.SetInt(x)
			return
		case float64:
			hint := "write a whole number without a decimal point"
			if x == float64(int64(x)) && finite(x) {
				hint = "write " + name + " = " + fmtInt(int64(x)) + " (no decimal point)"
			}
			p.typeProblem(key, name, v, "an integer", hint)
			return
		}
		p.typeProblem(key, name, v, "an integer", numberHint(name, v))
	case reflect.String:
		if s, ok := v.(string); ok {
			dst.SetString(s)
			return
		}
		p.typeProblem(key, name, v, "a string", "put the text in double quotes, e.g. "+name+` = "..."`)
	case reflect.Bool:
		if b, ok := v.(bool); ok {
			dst.SetBool(b)
			return
		}
		p.typeProblem(key, name, v, "true or false", "write "+name+" = true or "+name+" = false, without quotes")
	default:
		// Only the kinds above appear in the schema; a new kind must be
		// added here before a section may use it.
		p.add(key, "", noDecoder)
	}
}

// noDecoder is the problem for a schema field of a kind decodeValue cannot
// fill.
const noDecoder = "cannot be read: this version has no decoder for its type (a bug in rollerbed)"

// indexed returns path with "[i]" added to its last component: the path of
// element i of the array at path, as the scanner and problems name it.
func indexed(path []string, i int) []string {
	out := append([]string{}, path...)
	out[len(out)-1] += "[" + strconv.Itoa(i) + "]"
	return out
}

// decodeTables fills the slice of structs dst from an array of tables,
// written with [[key]] headers or inline as [{...}, {...}]. Element i is
// decoded under the path key[i].
func decodeTables(v any, path []string, key string, dst reflect.Value, p *problems) {
	var elems []map[string]any
	switch x := v.(type) {
	case []map[string]any:
		elems = x
	case []any:
		for _, e := range x {
			m, ok := e.(map[string]any)
			if !ok {
				p.add(key, "", "must be an array of tables, not an array holding "+tomlType(e)+"; write each element under its own [["+key+"]] header")
				return
			}
			elems = append(elems, m)
		}
	default:
		value := ""
		if _, table := v.(map[string]any); !table {
			value = fmtValue(v)
		}
		p.add(key, value, "must be an array of tables, not "+tomlType(v)+"; write each element under its own [["+key+"]] header (two brackets)")
		return
	}
	out := reflect.MakeSlice(dst.Type(), len(elems), len(elems))
	for i, m := range elems {
		ep := indexed(path, i)
		p.given[keyString(ep)] = true
		decodeTable(m, ep, out.Index(i), p)
	}
	dst.Set(out)
}

// decodeRows fills the slice of fixed-size float arrays dst from a TOML
// array of rows, each an array of numbers ([[0.0, 4.0], [0.2, 4.0]]).
// Integers are accepted as numbers. A bad row is a problem of its own key,
// key[i], and is left zero.
func decodeRows(v any, path []string, key string, f field, dst reflect.Value, p *problems) {
	n := dst.Type().Elem().Len()
	shape := f.row
	if shape == "" {
		shape = "[" + strings.TrimSuffix(strings.Repeat("x, ", n), ", ") + "]"
	}
	example := f.name + " = [" + shape + ", " + shape + ", ...]"
	rows, ok := v.([]any)
	if !ok {
		p.typeProblem(key, f.name, v, "an array of rows "+shape, "write "+example)
		return
	}
	out := reflect.MakeSlice(dst.Type(), len(rows), len(rows))
	for i, e := range rows {
		ek := keyString(indexed(path, i))
		row, ok := e.([]any)
		if !ok {
			p.add(ek, fmtValue(e), "must be a row "+shape+" of "+strconv.Itoa(n)+" numbers, not "+tomlType(e)+"; write "+example)
			continue
		}
		if len(row) != n {
			p.add(ek, fmtValue(e), "must be a row "+shape+" of "+strconv.Itoa(n)+" numbers, not "+strconv.Itoa(len(row)))
			continue
		}
		for j, x := range row {
			switch y := x.(type) {
			case float64:
				out.Index(i).Index(j).SetFloat(y)
				continue
			case int64:
				out.Index(i).Index(j).SetFloat(float64(y))
				continue
			}
			p.add(ek, fmtValue(e), "must be a row "+shape+" of "+strconv.Itoa(n)+" numbers; its "+ordinal(j+1)+" entry is "+tomlType(x)+", not a number")
			break
		}
	}
	dst.Set(out)
}

// decodeStrings fills the string slice dst from a TOML array of strings
// (fields = ["u", "w"]). An entry of another type is a problem of its own
// key, key[i], and is left "". An empty array gives an empty, non-nil
// slice; the section's check decides whether that is allowed.
func decodeStrings(v any, path []string, key string, f field, dst reflect.Value, p *problems) {
	example := f.name + ` = ["...", "..."]`
	entries, ok := v.([]any)
	if !ok {
		hint := "write " + example
		if s, isString := v.(string); isString {
			hint = "write " + f.name + " = [" + strconv.Quote(s) + "] for a list of one"
		}
		p.typeProblem(key, f.name, v, "an array of strings", hint)
		return
	}
	out := reflect.MakeSlice(dst.Type(), len(entries), len(entries))
	for i, e := range entries {
		s, ok := e.(string)
		if !ok {
			p.add(keyString(indexed(path, i)), fmtValue(e), "must be a string, not "+tomlType(e)+" (the "+ordinal(i+1)+" entry of "+key+"); put each entry in double quotes, e.g. "+example)
			continue
		}
		out.Index(i).SetString(s)
	}
	dst.Set(out)
}

// numberHint suggests how to write a number that came as another type.
func numberHint(name string, v any) string {
	if s, ok := v.(string); ok {
		if _, err := strconv.ParseFloat(strings.TrimSpace(s), 64); err == nil {
			return "write " + name + " = " + strings.TrimSpace(s) + " without quotes"
		}
	}
	return "write a plain number, e.g. " + name + " = 1.0"
}

// typeProblem records a value of the wrong TOML type.
func (p *problems) typeProblem(key, name string, v any, want, hint string) {
	value := ""
	if _, table := v.(map[string]any); !table {
		value = fmtValue(v)
	}
	p.add(key, value, note("must be "+want+", not "+tomlType(v), hint))
}

// tomlType names the TOML type of a decoded value, with an article.
func tomlType(v any) string {
	switch v.(type) {
	case string:
		return "a string"
	case int64:
		return "an integer"
	case float64:
		return "a float"
	case bool:
		return "a boolean"
	case map[string]any:
		return "a table"
	case []map[string]any:
		return "an array of tables"
	case []any:
		return "an array"
	case time.Time:
		return "a date or time"
	}
	return "a value of another type"
}

// fmtValue writes a decoded value roughly as TOML would; used only when
// the scanner holds no raw text for the key.
func fmtValue(v any) string {
	switch x := v.(type) {
	case string:
		return strconv.Quote(x)
	case int64:
		return fmtInt(x)
	case float64:
		return fmtFloat(x)
	case bool:
		return strconv.FormatBool(x)
	case []any, []map[string]any:
		return "[...]"
	}
	return ""
}

// unknownKey records a key that the schema does not have under prefix,
// suggesting a close key in the same table or the table where it belongs.
func (p *problems) unknownKey(prefix []string, name string, v any, fs []field) {
	path := append(append([]string{}, prefix...), component(name))
	key := keyString(path)
	_, isTable := v.(map[string]any)

	where, what := "at the top level", "key"
	if isTable {
		what = "table"
	}
	if len(prefix) > 0 {
		where = "in [" + keyString(prefix) + "]"
		if base, n, ok := splitIndex(keyString(prefix)); ok {
			where = "in the " + ordinal(n+1) + " [[" + base + "]] (" + keyString(prefix) + ")"
		}
	}
	names := make([]string, len(fs))
	for i, f := range fs {
		names[i] = f.name
		switch {
		case f.array:
			names[i] = "[[" + f.name + "]]"
		case f.table:
			names[i] = "[" + f.name + "]"
		}
	}
	msg := "unknown " + what + " " + where
	if s := suggestKey(prefix, name, fs); s != "" {
		msg += "; did you mean " + s + "?"
		if strings.EqualFold(lastComponent(s), component(name)) {
			msg += " (keys are case-sensitive)"
		}
	}
	if len(names) > 0 {
		msg += " (known here: " + strings.Join(names, ", ") + ")"
	} else {
		msg += "; this table has no keys"
	}
	value := ""
	if !isTable {
		value = fmtValue(v)
	}
	p.add(key, value, msg)
}

// suggestKey proposes a replacement for an unknown key: a close key of the
// same table, or the same key in another table.
func suggestKey(prefix []string, name string, fs []field) string {
	names := make([]string, len(fs))
	for i, f := range fs {
		names[i] = f.name
	}
	if s := closest(name, names); s != "" {
		return keyString(append(append([]string{}, prefix...), component(s)))
	}
	var elsewhere []string
	for _, k := range caseSchema {
		if k.name == name {
			elsewhere = append(elsewhere, k.key)
		}
	}
	if len(elsewhere) == 1 {
		return elsewhere[0]
	}
	return ""
}

// lastComponent returns the last component of a dotted key.
func lastComponent(key string) string {
	if parent := parentKey(key); parent != "" {
		return key[len(parent)+1:]
	}
	return key
}

// closest returns the candidate nearest to s: equal apart from letter case,
// or within a small edit distance (1 for short words, 2 from five letters
// on, 3 from nine). It returns "" when none is close or two tie.
func closest(s string, candidates []string) string {
	for _, c := range candidates {
		if strings.EqualFold(s, c) {
			return c
		}
	}
	limit := 1
	if len(s) >= 5 {
		limit = 2
	}
	if len(s) >= 9 {
		limit = 3
	}
	best, bestD, tie := "", limit+1, false
	for _, c := range candidates {
		d := editDistance(s, c)
		switch {
		case d < bestD:
			best, bestD, tie = c, d, false
		case d == bestD:
			tie = true
		}
	}
	if tie || best == "" {
		return ""
	}
	return best
}

// editDistance is the optimal-string-alignment distance between a and b:
// insertions, deletions, substitutions and swaps of neighbours each cost 1.
// It works on bytes; keys are ASCII.
func editDistance(a, b string) int {
	if len(a) > 64 || len(b) > 64 {
		return 1 << 20 // not worth comparing
	}
	prev2 := make([]int, len(b)+1)
	prev := make([]int, len(b)+1)
	cur := make([]int, len(b)+1)
	for j := range prev {
		prev[j] = j
	}
	for i := 1; i <= len(a); i++ {
		cur[0] = i
		for j := 1; j <= len(b); j++ {
			cost := 1
			if a[i-1] == b[j-1] {
				cost = 0
			}
			cur[j] = min(prev[j]+1, cur[j-1]+1, prev[j-1]+cost)
			if i > 1 && j > 1 && a[i-1] == b[j-2] && a[i-2] == b[j-1] {
				cur[j] = min(cur[j], prev2[j-2]+1)
			}
		}
		prev2, prev, cur = prev, cur, prev2
	}
	return prev[len(b)]
}
