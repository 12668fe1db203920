package stricttoml

import (
	"errors"
	"reflect"
	"sort"
	"strconv"
	"strings"
	"time"

	"github.com/BurntSushi/toml"
)

// Format describes one kind of file for its messages.
type Format struct {
	// Doc names the kind of file, "case file"; problems of text read
	// without a file name print it in place of the name.
	Doc string
	// Example says where a correct file of this kind is found, for
	// syntax errors: "the template that `rollerbed init FILE` writes".
	Example string
}

// Document is a file that passed the TOML syntax check, ready to be
// decoded into the struct of its kind.
type Document struct {
	// Problems collects the problems of the file; the decoder adds the
	// unknown keys and values of the wrong type, the file kind's checks
	// add the rest.
	Problems *Problems
	raw      map[string]any
}

// Read parses text, the file named file ("" for text without a name), as
// TOML. Syntax errors, and text nesting deeper than MaxDepth, give an
// *Errors of one problem; the key positions are scanned before the TOML
// library sees the text, so that absurd nesting is refused in time linear
// in its length.
func (f Format) Read(text []byte, file string) (*Document, error) {
	pos, deep := Scan(string(text))
	if deep > 0 {
		return nil, &Errors{Problems: []*Problem{{Doc: f.Doc, File: file, Line: deep, Msg: "tables, arrays and dotted keys nest more than " + strconv.Itoa(MaxDepth) +
			" levels deep here, which no " + f.Doc + " needs; write the values at most a few levels deep, as in " + f.Example}}}
	}
	var raw map[string]any
	if _, err := toml.Decode(string(text), &raw); err != nil {
		return nil, f.syntaxError(err, file)
	}
	return &Document{Problems: newProblems(f.Doc, file, true, pos), raw: raw}, nil
}

// syntaxError turns an error of the TOML parser into a one-problem *Errors.
func (f Format) syntaxError(err error, file string) error {
	var pe toml.ParseError
	if !errors.As(err, &pe) {
		return &Errors{Problems: []*Problem{{Doc: f.Doc, File: file, Msg: OneLine("cannot read the TOML: " + err.Error())}}}
	}
	msg := "TOML syntax error: " + pe.Message
	if pe.LastKey != "" {
		msg += " (after key " + pe.LastKey + ")"
	}
	msg += "; see https://toml.io for the syntax, or compare with " + f.Example
	return &Errors{Problems: []*Problem{{Doc: f.Doc, File: file, Line: pe.Position.Line, Col: pe.Position.Col, Msg: OneLine(msg)}}}
}

// Positions returns the line and raw text of every key of the file, as
// Scan finds them; LineOf looks a key up in them.
func (d *Document) Positions() map[string]Pos { return d.Problems.pos }

// Empty reports whether the file sets no keys.
func (d *Document) Empty() bool { return len(d.raw) == 0 }

// Decode fills dst, a pointer to a struct, from the document by the
// schema of dst's type: keys are matched exactly (case-sensitive), a key
// the schema does not know is a problem (with a suggestion), and so is a
// value of the wrong type; all of them are collected, not just the first.
// Fields of keys the file does not hold keep their values.
func (d *Document) Decode(dst any) {
	rv := reflect.ValueOf(dst)
	if rv.Kind() != reflect.Pointer || rv.Elem().Kind() != reflect.Struct {
		panic("stricttoml: Decode needs a pointer to a struct, not " + rv.Type().String())
	}
	s := SchemaOf(rv.Elem().Type())
	w := walker{p: d.Problems, schema: s}
	w.table(d.raw, nil, s.Root, rv.Elem())
}

// walker walks a schema over a decoded document.
type walker struct {
	p      *Problems
	schema *Schema
}

// table fills the struct rv from the TOML table m, whose dotted path is
// prefix. It records which keys the text holds, and a problem for each
// value of the wrong type and each key the schema does not know.
func (w walker) table(m map[string]any, prefix []string, t *Field, rv reflect.Value) {
	for _, f := range t.Fields {
		v, ok := m[f.Name]
		if !ok {
			continue
		}
		path := append(append([]string{}, prefix...), Component(f.Name))
		key := KeyString(path)
		w.p.given[key] = true
		w.value(v, path, key, f, rv.Field(f.Index))
	}
	var unknown []string
	for name := range m {
		if t.Key(name) == nil {
			unknown = append(unknown, name)
		}
	}
	sort.Strings(unknown)
	for _, name := range unknown {
		w.unknownKey(prefix, name, m[name], t)
	}
}

// value stores the TOML value v of the schema key f into dst, or records a
// type problem.
func (w walker) value(v any, path []string, key string, f *Field, dst reflect.Value) {
	p := w.p
	switch f.Kind {
	case Table:
		sub, ok := v.(map[string]any)
		if !ok {
			p.Add(key, "", "must be a table, not "+TypeName(v)+"; write it as a ["+key+"] section with its keys below")
			return
		}
		if dst.Kind() == reflect.Pointer {
			if dst.IsNil() {
				dst.Set(reflect.New(dst.Type().Elem()))
			}
			dst = dst.Elem()
		}
		w.table(sub, path, f, dst)
	case Tables:
		w.tables(v, path, key, f, dst)
	case Rows:
		w.rows(v, path, key, f, dst)
	case Strings, Ints:
		w.list(v, path, key, f, dst)
	case Float:
		switch x := v.(type) {
		case float64:
			dst.SetFloat(x)
			return
		case int64:
			dst.SetFloat(float64(x))
			return
		}
		p.typeProblem(key, v, "a number", numberHint(f, v))
	case Int:
		switch x := v.(type) {
		case int64:
			if dst.OverflowInt(x) {
				p.Add(key, fmtInt(x), "is too large an integer")
				return
			}
			dst.SetInt(x)
			return
		case float64:
			hint := "write a whole number without a decimal point"
			if x == float64(int64(x)) && Finite(x) {
				hint = "write " + f.Name + " = " + fmtInt(int64(x)) + " (no decimal point)"
			}
			p.typeProblem(key, v, "an integer", hint)
			return
		}
		p.typeProblem(key, v, "an integer", numberHint(f, v))
	case String:
		if s, ok := v.(string); ok {
			dst.SetString(s)
			return
		}
		p.typeProblem(key, v, "a string", "put the text in double quotes, e.g. "+f.example(f.Name+` = "..."`))
	case Bool:
		if b, ok := v.(bool); ok {
			dst.SetBool(b)
			return
		}
		p.typeProblem(key, v, "true or false", "write "+f.Name+" = true or "+f.Name+" = false, without quotes")
	case Any:
		dst.Set(reflect.ValueOf(&v).Elem())
	default:
		// Only the kinds above appear in a schema; a new kind must be
		// added here before a file may use it.
		p.Add(key, "", noDecoder)
	}
}

// example returns the field's example line, or def.
func (f *Field) example(def string) string {
	if f.Example != "" {
		return f.Example
	}
	return def
}

// noDecoder is the problem for a schema field of a kind the decoder cannot
// fill.
const noDecoder = "cannot be read: this version has no decoder for its type (a bug in rollerbed)"

// Indexed returns path with "[i]" added to its last component: the path of
// element i of the array at path, as the scanner and problems name it.
func Indexed(path []string, i int) []string {
	out := append([]string{}, path...)
	out[len(out)-1] += "[" + strconv.Itoa(i) + "]"
	return out
}

// tables fills the slice of structs dst from an array of tables, written
// with [[key]] headers or inline as [{...}, {...}]. Element i is decoded
// under the path key[i].
func (w walker) tables(v any, path []string, key string, f *Field, dst reflect.Value) {
	var elems []map[string]any
	switch x := v.(type) {
	case []map[string]any:
		elems = x
	case []any:
		for _, e := range x {
			m, ok := e.(map[string]any)
			if !ok {
				w.p.Add(key, "", "must be an array of tables, not an array holding "+TypeName(e)+"; write each element under its own [["+key+"]] header")
				return
			}
			elems = append(elems, m)
		}
	default:
		value := ""
		if _, table := v.(map[string]any); !table {
			value = FormatValue(v)
		}
		w.p.Add(key, value, "must be an array of tables, not "+TypeName(v)+"; write each element under its own [["+key+"]] header (two brackets)")
		return
	}
	out := reflect.MakeSlice(dst.Type(), len(elems), len(elems))
	for i, m := range elems {
		ep := Indexed(path, i)
		w.p.given[KeyString(ep)] = true
		w.table(m, ep, f, out.Index(i))
	}
	dst.Set(out)
}

// rows fills the slice of fixed-size float arrays dst from a TOML array of
// rows, each an array of numbers ([[0.0, 4.0], [0.2, 4.0]]). Integers are
// accepted as numbers. A bad row is a problem of its own key, key[i], and
// is left zero.
func (w walker) rows(v any, path []string, key string, f *Field, dst reflect.Value) {
	p := w.p
	n := dst.Type().Elem().Len()
	shape := f.Row
	if shape == "" {
		shape = "[" + strings.TrimSuffix(strings.Repeat("x, ", n), ", ") + "]"
	}
	example := f.Name + " = [" + shape + ", " + shape + ", ...]"
	rows, ok := v.([]any)
	if !ok {
		p.typeProblem(key, v, "an array of rows "+shape, "write "+example)
		return
	}
	out := reflect.MakeSlice(dst.Type(), len(rows), len(rows))
	for i, e := range rows {
		ek := KeyString(Indexed(path, i))
		row, ok := e.([]any)
		if !ok {
			p.Add(ek, FormatValue(e), "must be a row "+shape+" of "+strconv.Itoa(n)+" numbers, not "+TypeName(e)+"; write "+example)
			continue
		}
		if len(row) != n {
			p.Add(ek, FormatValue(e), "must be a row "+shape+" of "+strconv.Itoa(n)+" numbers, not "+strconv.Itoa(len(row)))
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
			p.Add(ek, FormatValue(e), "must be a row "+shape+" of "+strconv.Itoa(n)+" numbers; its "+Ordinal(j+1)+" entry is "+TypeName(x)+", not a number")
			break
		}
	}
	dst.Set(out)
}

// list fills the slice dst from a TOML array of strings
// (fields = ["u", "w"]) or of integers (seeds = [1, 2, 3]). An entry of
// another type is a problem of its own key, key[i], and is left zero. An
// empty array gives an empty, non-nil slice; the file kind's check decides
// whether that is allowed.
func (w walker) list(v any, path []string, key string, f *Field, dst reflect.Value) {
	entry, example, fix := "a string", f.example(f.Name+` = ["...", "..."]`), "put each entry in double quotes, e.g. "
	if f.Kind == Ints {
		entry, example, fix = "an integer", f.example(f.Name+" = [1, 2, 3]"), "write e.g. "
	}
	entries, ok := v.([]any)
	if !ok {
		hint := "write " + example
		if s, isString := v.(string); isString && f.Kind == Strings {
			hint = "write " + f.Name + " = [" + strconv.Quote(s) + "] for a list of one"
		}
		w.p.typeProblem(key, v, f.Kind.String(), hint)
		return
	}
	out := reflect.MakeSlice(dst.Type(), len(entries), len(entries))
	for i, e := range entries {
		if reflect.TypeOf(e) != dst.Type().Elem() {
			w.p.Add(KeyString(Indexed(path, i)), FormatValue(e), "must be "+entry+", not "+TypeName(e)+" (the "+Ordinal(i+1)+" entry of "+key+"); "+fix+example)
			continue
		}
		out.Index(i).Set(reflect.ValueOf(e))
	}
	dst.Set(out)
}

// numberHint suggests how to write a number that came as another type: the
// same number without quotes when it is a finite one (a quoted nan or inf
// would only be refused next), else an example.
func numberHint(f *Field, v any) string {
	if s, ok := v.(string); ok {
		if x, err := strconv.ParseFloat(strings.TrimSpace(s), 64); err == nil && Finite(x) {
			return "write " + f.Name + " = " + strings.TrimSpace(s) + " without quotes"
		}
	}
	return "write a plain number, e.g. " + f.example(f.Name+" = 1.0")
}

// typeProblem records a value of the wrong TOML type.
func (p *Problems) typeProblem(key string, v any, want, hint string) {
	value := ""
	if _, table := v.(map[string]any); !table {
		value = FormatValue(v)
	}
	p.Add(key, value, Note("must be "+want+", not "+TypeName(v), hint))
}

// TypeName names the TOML type of a decoded value, with an article: "a
// string", "an array of tables".
func TypeName(v any) string {
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

// FormatValue writes a decoded value as TOML would: strings quoted,
// floats with a decimal point or an exponent (inf, nan), arrays of up to
// four values in full and longer ones as [...], tables as {...}. Problems
// use it only when the file holds no raw text for the key.
func FormatValue(v any) string {
	switch x := v.(type) {
	case string:
		return strconv.Quote(x)
	case int64:
		return fmtInt(x)
	case float64:
		return formatTOMLFloat(x)
	case bool:
		return strconv.FormatBool(x)
	case []any:
		if len(x) <= 4 {
			parts := make([]string, len(x))
			for i, e := range x {
				parts[i] = FormatValue(e)
			}
			return "[" + strings.Join(parts, ", ") + "]"
		}
		return "[...]"
	case map[string]any, []map[string]any:
		return "{...}"
	case time.Time:
		return x.Format(time.RFC3339Nano)
	case interface{ String() string }:
		return x.String()
	}
	return ""
}

// formatTOMLFloat writes a float as TOML does: the shortest text that
// reads back to the same number, always with a decimal point or an
// exponent.
func formatTOMLFloat(f float64) string {
	s := strconv.FormatFloat(f, 'g', -1, 64)
	switch s {
	case "+Inf":
		return "inf"
	case "-Inf":
		return "-inf"
	case "NaN":
		return "nan"
	}
	if !strings.ContainsAny(s, ".eEn") {
		s += ".0"
	}
	return s
}
