package sweep

import (
	"fmt"
	"math"
	"reflect"
	"sort"
	"strconv"
	"strings"

	"rollerbed/io/casefile"
	"rollerbed/io/stricttoml"
)

// The case schema, read from the toml tags of casefile.Case, tells which
// dotted keys an axis may vary and what type their values have. The
// member cases are then checked in full by casefile.Parse; the schema only
// lets a sweep file's mistakes be named against the sweep file.

// caseSchema is the schema of a case file.
var caseSchema = stricttoml.SchemaOf(reflect.TypeOf(casefile.Case{}))

// closest returns the candidate nearest to s, or "".
func closest(s string, candidates []string) string { return stricttoml.Closest(s, candidates) }

// names returns the keys of a table field, in field order.
func names(f *stricttoml.Field) []string {
	out := make([]string, len(f.Fields))
	for i, sub := range f.Fields {
		out[i] = sub.Name
	}
	return out
}

// step is one component of a case key: a name, and for an element of an
// array of tables its index (-1 otherwise).
type step struct {
	name  string
	index int
}

// caseKey is a resolved case key.
type caseKey struct {
	text  string // as written in the sweep file
	steps []step
	leaf  *stricttoml.Field
}

// resolveKey checks a dotted case key against the schema. Elements of
// arrays of tables are named with an index from 0, canopy.patch[1].start.
// The error says what is wrong and the fix.
func resolveKey(key string) (*caseKey, error) {
	if strings.TrimSpace(key) == "" {
		return nil, fmt.Errorf("is empty; give the dotted key of a case-file value, e.g. key = \"canopy.frontal_area\"")
	}
	ck := &caseKey{text: key}
	n := caseSchema.Root
	parts := strings.Split(key, ".")
	for i, part := range parts {
		name, index, err := splitPart(part)
		if err != nil {
			return nil, fmt.Errorf("%v in %q; write keys as in the case file, e.g. canopy.frontal_area or canopy.patch[0].start", err, part)
		}
		where := "at the top level of a case file"
		if i > 0 {
			where = "in [" + strings.Join(parts[:i], ".") + "]"
			if prev := ck.steps[i-1]; prev.index >= 0 {
				where = "in the " + stricttoml.Ordinal(prev.index+1) + " [[" + dotted(ck.steps[:i], false) + "]]"
			}
		}
		if !n.Kind.IsTable() {
			return nil, fmt.Errorf("is not a key of the case file: %s is %s, not a table", strings.Join(parts[:i], "."), n.Kind)
		}
		sub := n.Key(name)
		if sub == nil {
			msg := "is not a key of the case file: no " + strconv.Quote(name) + " " + where
			switch known := names(n); {
			case closest(name, known) != "":
				msg += "; did you mean " + strings.Join(append(append([]string{}, parts[:i]...), closest(name, known)), ".") + "?"
			case elsewhere(name) != "":
				msg += "; did you mean " + elsewhere(name) + "?"
			default:
				msg += " (known here: " + strings.Join(known, ", ") + "; `rollerbed init FILE` writes every key with its meaning)"
			}
			return nil, fmt.Errorf("%s", msg)
		}
		switch {
		case sub.Kind == stricttoml.Tables && index < 0 && i < len(parts)-1:
			return nil, fmt.Errorf("names an element of the array of tables %s without its index; write %s[0].%s for the first element",
				strings.Join(parts[:i+1], "."), strings.Join(parts[:i+1], "."), strings.Join(parts[i+1:], "."))
		case sub.Kind != stricttoml.Tables && index >= 0:
			return nil, fmt.Errorf("indexes %s, which is %s, not an array of tables", strings.Join(append(append([]string{}, parts[:i]...), name), "."), sub.Kind)
		}
		ck.steps = append(ck.steps, step{name: name, index: index})
		n = sub
	}
	switch n.Kind {
	case stricttoml.Table, stricttoml.Tables:
		if n.Kind == stricttoml.Tables && ck.steps[len(ck.steps)-1].index >= 0 {
			return nil, fmt.Errorf("names a whole [[%s]] element; vary one key inside it, e.g. %s.%s", stripIndex(key), key, n.Fields[0].Name)
		}
		return nil, fmt.Errorf("names the table [%s], not a value; vary one key inside it, e.g. %s.%s", key, key, firstValue(n))
	case stricttoml.Float, stricttoml.Int, stricttoml.String, stricttoml.Bool, stricttoml.Strings, stricttoml.Rows:
	default:
		return nil, fmt.Errorf("cannot be varied by a sweep (its type is not a TOML value a sweep sets)")
	}
	ck.leaf = n
	return ck, nil
}

// firstValue returns the first key of a table that holds a value, for
// examples in messages.
func firstValue(n *stricttoml.Field) string {
	for _, sub := range n.Fields {
		if !sub.Kind.IsTable() {
			return sub.Name
		}
	}
	if len(n.Fields) > 0 {
		return n.Fields[0].Name
	}
	return "..."
}

func stripIndex(key string) string {
	if i := strings.LastIndexByte(key, '['); i >= 0 {
		return key[:i]
	}
	return key
}

// elsewhere returns the one full key whose last component is name, or "".
func elsewhere(name string) string {
	var found []string
	var walk func(n *stricttoml.Field, prefix string)
	walk = func(n *stricttoml.Field, prefix string) {
		for _, s := range n.Fields {
			full := s.Name
			if prefix != "" {
				full = prefix + "." + s.Name
			}
			if s.Kind == stricttoml.Tables {
				full += "[0]"
			}
			if s.Name == name && !s.Kind.IsTable() {
				found = append(found, full)
			}
			if s.Kind.IsTable() {
				walk(s, full)
			}
		}
	}
	walk(caseSchema.Root, "")
	sort.Strings(found)
	if len(found) == 1 {
		return found[0]
	}
	return ""
}

// splitPart splits a component of a case key as a sweep file writes it,
// "patch[1]", into "patch" and 1, and "height" into "height" and -1.
func splitPart(part string) (string, int, error) {
	open := strings.IndexByte(part, '[')
	if open < 0 {
		if part == "" {
			return "", -1, fmt.Errorf("an empty component")
		}
		if strings.ContainsAny(part, "] \t\"'") {
			return "", -1, fmt.Errorf("a character that is not part of a key")
		}
		return part, -1, nil
	}
	if !strings.HasSuffix(part, "]") || open == 0 {
		return "", -1, fmt.Errorf("a malformed index")
	}
	n, err := strconv.Atoi(part[open+1 : len(part)-1])
	if err != nil || n < 0 {
		return "", -1, fmt.Errorf("an index that is not a whole number from 0")
	}
	return part[:open], n, nil
}

// convert checks a value for the key's type and returns it as the case
// file holds it: float64 for numbers, int64 for integers, and so on. The
// error says what is wrong and the fix.
func (k *caseKey) convert(v any) (any, error) {
	var out any
	var err error
	switch k.leaf.Kind {
	case stricttoml.Float, stricttoml.Int:
		out, err = k.number(v)
	case stricttoml.String:
		if _, ok := v.(string); !ok {
			return nil, fmt.Errorf("must be a string for %s, not %s; put it in double quotes", k.text, stricttoml.TypeName(v))
		}
		out = v
	case stricttoml.Bool:
		if _, ok := v.(bool); ok {
			out = v
		}
	case stricttoml.Strings, stricttoml.Rows:
		out, err = k.array(v)
	}
	if out == nil && err == nil {
		err = fmt.Errorf("must be %s for %s, not %s", k.leaf.Kind, k.text, stricttoml.TypeName(v))
	}
	return out, err
}

// number converts a value for a float or integer key; nil, nil for a value
// that is no number.
func (k *caseKey) number(v any) (any, error) {
	switch x := v.(type) {
	case float64:
		switch {
		case k.leaf.Kind == stricttoml.Float && (math.IsNaN(x) || math.IsInf(x, 0)):
			return nil, fmt.Errorf("must be a finite number for %s", k.text)
		case k.leaf.Kind == stricttoml.Float:
			return x, nil
		case x == math.Trunc(x) && !math.IsInf(x, 0) && math.Abs(x) < 1<<53:
			return nil, fmt.Errorf("must be an integer for %s; write %d without a decimal point", k.text, int64(x))
		}
		return nil, fmt.Errorf("must be an integer for %s, not %s", k.text, stricttoml.FormatValue(x))
	case int64:
		if k.leaf.Kind == stricttoml.Float {
			return float64(x), nil
		}
		return x, nil
	}
	return nil, nil
}

// array converts a value for an array of strings or of rows; nil, nil
// for a value that is no array.
func (k *caseKey) array(v any) (any, error) {
	a, ok := v.([]any)
	if !ok {
		if s, isString := v.(string); isString && k.leaf.Kind == stricttoml.Strings {
			return nil, fmt.Errorf("must be an array of strings for %s; write [%q] for a list of one", k.text, s)
		}
		return nil, nil
	}
	for i, e := range a {
		switch _, isString := e.(string); {
		case k.leaf.Kind == stricttoml.Strings && !isString:
			return nil, fmt.Errorf("must be an array of strings for %s; its %s entry is %s", k.text, stricttoml.Ordinal(i+1), stricttoml.TypeName(e))
		case k.leaf.Kind == stricttoml.Rows:
			if _, isRow := e.([]any); !isRow {
				return nil, fmt.Errorf("must be an array of rows for %s, e.g. [[0.0, 4.0], [0.2, 4.0]]; its %s entry is %s", k.text, stricttoml.Ordinal(i+1), stricttoml.TypeName(e))
			}
		}
	}
	return v, nil
}

// set stores v at the key in the decoded case m, making the tables on the
// way when the base has none. An element of an array of tables must exist
// in the base.
func (k *caseKey) set(m map[string]any, v any) error {
	cur := m
	for i, s := range k.steps {
		last := i == len(k.steps)-1
		if s.index >= 0 {
			elems, err := tablesOf(cur[s.name])
			if err != nil || s.index >= len(elems) {
				return fmt.Errorf("the base case has %d [[%s]] element(s), so %s does not exist; add the element to the base case, or index one that exists (from 0)",
					len(elems), dotted(k.steps[:i+1], false), dotted(k.steps[:i+1], true))
			}
			cur[s.name] = elems
			cur = elems[s.index]
			continue
		}
		if last {
			cur[s.name] = v
			return nil
		}
		next, ok := cur[s.name].(map[string]any)
		if !ok {
			next = map[string]any{}
			cur[s.name] = next
		}
		cur = next
	}
	return nil
}

// get returns the value at the key in the decoded case m.
func (k *caseKey) get(m map[string]any) (any, bool) {
	var cur any = m
	for _, s := range k.steps {
		t, ok := cur.(map[string]any)
		if !ok {
			return nil, false
		}
		cur, ok = t[s.name]
		if !ok {
			return nil, false
		}
		if s.index >= 0 {
			elems, err := tablesOf(cur)
			if err != nil || s.index >= len(elems) {
				return nil, false
			}
			cur = elems[s.index]
		}
	}
	return cur, true
}

func tablesOf(v any) ([]map[string]any, error) {
	switch x := v.(type) {
	case []map[string]any:
		return x, nil
	case []any:
		out := make([]map[string]any, len(x))
		for i, e := range x {
			m, ok := e.(map[string]any)
			if !ok {
				return nil, fmt.Errorf("not an array of tables")
			}
			out[i] = m
		}
		return out, nil
	case nil:
		return nil, nil
	}
	return nil, fmt.Errorf("not an array of tables")
}

func dotted(steps []step, withIndex bool) string {
	parts := make([]string, len(steps))
	for i, s := range steps {
		parts[i] = s.name
		if withIndex && s.index >= 0 {
			parts[i] += "[" + strconv.Itoa(s.index) + "]"
		}
	}
	return strings.Join(parts, ".")
}

// deepCopy copies a decoded TOML document.
func deepCopy(v any) any {
	switch x := v.(type) {
	case map[string]any:
		out := make(map[string]any, len(x))
		for k, e := range x {
			out[k] = deepCopy(e)
		}
		return out
	case []map[string]any:
		out := make([]map[string]any, len(x))
		for i, e := range x {
			out[i] = deepCopy(e).(map[string]any)
		}
		return out
	case []any:
		out := make([]any, len(x))
		for i, e := range x {
			out[i] = deepCopy(e)
		}
		return out
	}
	return v
}
