package sweep

import (
	"fmt"
	"math"
	"reflect"
	"sort"
	"strconv"
	"strings"

	"rollerbed/io/casefile"
)

// The case schema, read from the toml tags of casefile.Case, tells which
// dotted keys an axis may vary and what type their values have. The
// member cases are then checked in full by casefile.Parse; the schema only
// lets a sweep file's mistakes be named against the sweep file.

// kind is the type of a case key.
type kind int

const (
	kindTable   kind = iota // a [table]
	kindTables              // an array of tables, [[table]]
	kindFloat               // a number (integers accepted)
	kindInt                 // an integer
	kindString              // a string
	kindBool                // true or false
	kindStrings             // an array of strings
	kindRows                // an array of rows of numbers
	kindOther               // a type an axis cannot set
)

func (k kind) String() string {
	switch k {
	case kindTable:
		return "a table"
	case kindTables:
		return "an array of tables"
	case kindFloat:
		return "a number"
	case kindInt:
		return "an integer"
	case kindString:
		return "a string"
	case kindBool:
		return "true or false"
	case kindStrings:
		return "an array of strings"
	case kindRows:
		return "an array of rows of numbers"
	}
	return "a value of another type"
}

// node is one key of the schema.
type node struct {
	kind  kind
	names []string         // the keys of a table or of an array's elements, in field order
	sub   map[string]*node // by name
}

// caseSchema is the schema of a case file.
var caseSchema = schemaOf(reflect.TypeOf(casefile.Case{}))

func schemaOf(t reflect.Type) *node {
	n := &node{kind: kindTable, sub: map[string]*node{}}
	for i := 0; i < t.NumField(); i++ {
		f := t.Field(i)
		name, _, _ := strings.Cut(f.Tag.Get("toml"), ",")
		if name == "" || name == "-" || !f.IsExported() {
			continue
		}
		n.names = append(n.names, name)
		n.sub[name] = fieldNode(f.Type)
	}
	return n
}

func fieldNode(t reflect.Type) *node {
	switch t.Kind() {
	case reflect.Struct:
		return schemaOf(t)
	case reflect.Pointer:
		if t.Elem().Kind() == reflect.Struct {
			return schemaOf(t.Elem())
		}
	case reflect.Slice:
		switch el := t.Elem(); {
		case el.Kind() == reflect.Struct:
			n := schemaOf(el)
			n.kind = kindTables
			return n
		case el.Kind() == reflect.String:
			return &node{kind: kindStrings}
		case el.Kind() == reflect.Array && el.Elem().Kind() == reflect.Float64:
			return &node{kind: kindRows}
		}
	case reflect.Float64, reflect.Float32:
		return &node{kind: kindFloat}
	case reflect.Int, reflect.Int64, reflect.Int32:
		return &node{kind: kindInt}
	case reflect.String:
		return &node{kind: kindString}
	case reflect.Bool:
		return &node{kind: kindBool}
	}
	return &node{kind: kindOther}
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
	leaf  *node
}

// resolveKey checks a dotted case key against the schema. Elements of
// arrays of tables are named with an index from 0, canopy.patch[1].start.
// The error says what is wrong and the fix.
func resolveKey(key string) (*caseKey, error) {
	if strings.TrimSpace(key) == "" {
		return nil, fmt.Errorf("is empty; give the dotted key of a case-file value, e.g. key = \"canopy.frontal_area\"")
	}
	ck := &caseKey{text: key}
	n := caseSchema
	parts := strings.Split(key, ".")
	for i, part := range parts {
		name, index, err := splitIndex(part)
		if err != nil {
			return nil, fmt.Errorf("%v in %q; write keys as in the case file, e.g. canopy.frontal_area or canopy.patch[0].start", err, part)
		}
		where := "at the top level of a case file"
		if i > 0 {
			where = "in [" + strings.Join(parts[:i], ".") + "]"
			if prev := ck.steps[i-1]; prev.index >= 0 {
				where = "in the " + ordinal(prev.index+1) + " [[" + dotted(ck.steps[:i], false) + "]]"
			}
		}
		if n.kind != kindTable && n.kind != kindTables {
			return nil, fmt.Errorf("is not a key of the case file: %s is %s, not a table", strings.Join(parts[:i], "."), n.kind)
		}
		sub, ok := n.sub[name]
		if !ok {
			msg := "is not a key of the case file: no " + strconv.Quote(name) + " " + where
			switch {
			case closest(name, n.names) != "":
				msg += "; did you mean " + strings.Join(append(append([]string{}, parts[:i]...), closest(name, n.names)), ".") + "?"
			case elsewhere(name) != "":
				msg += "; did you mean " + elsewhere(name) + "?"
			default:
				msg += " (known here: " + strings.Join(n.names, ", ") + "; `rollerbed init FILE` writes every key with its meaning)"
			}
			return nil, fmt.Errorf("%s", msg)
		}
		switch {
		case sub.kind == kindTables && index < 0 && i < len(parts)-1:
			return nil, fmt.Errorf("names an element of the array of tables %s without its index; write %s[0].%s for the first element",
				strings.Join(parts[:i+1], "."), strings.Join(parts[:i+1], "."), strings.Join(parts[i+1:], "."))
		case sub.kind != kindTables && index >= 0:
			return nil, fmt.Errorf("indexes %s, which is %s, not an array of tables", strings.Join(append(append([]string{}, parts[:i]...), name), "."), sub.kind)
		}
		ck.steps = append(ck.steps, step{name: name, index: index})
		n = sub
	}
	switch n.kind {
	case kindTable, kindTables:
		if n.kind == kindTables && ck.steps[len(ck.steps)-1].index >= 0 {
			return nil, fmt.Errorf("names a whole [[%s]] element; vary one key inside it, e.g. %s.%s", stripIndex(key), key, n.names[0])
		}
		return nil, fmt.Errorf("names the table [%s], not a value; vary one key inside it, e.g. %s.%s", key, key, firstValue(n, key))
	case kindOther:
		return nil, fmt.Errorf("cannot be varied by a sweep (its type is not a TOML value a sweep sets)")
	}
	ck.leaf = n
	return ck, nil
}

// firstValue returns the first key of a table that holds a value, for
// examples in messages.
func firstValue(n *node, key string) string {
	for _, name := range n.names {
		if s := n.sub[name]; s.kind != kindTable && s.kind != kindTables {
			return name
		}
	}
	if len(n.names) > 0 {
		return n.names[0]
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
	var walk func(n *node, prefix string)
	walk = func(n *node, prefix string) {
		for _, k := range n.names {
			s := n.sub[k]
			full := k
			if prefix != "" {
				full = prefix + "." + k
			}
			if s.kind == kindTables {
				full += "[0]"
			}
			if k == name && s.kind != kindTable && s.kind != kindTables {
				found = append(found, full)
			}
			if s.kind == kindTable || s.kind == kindTables {
				walk(s, full)
			}
		}
	}
	walk(caseSchema, "")
	sort.Strings(found)
	if len(found) == 1 {
		return found[0]
	}
	return ""
}

// splitIndex splits "patch[1]" into "patch" and 1, "height" into "height"
// and -1.
func splitIndex(part string) (string, int, error) {
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
	switch k.leaf.kind {
	case kindFloat:
		switch x := v.(type) {
		case float64:
			if math.IsNaN(x) || math.IsInf(x, 0) {
				return nil, fmt.Errorf("must be a finite number for %s", k.text)
			}
			return x, nil
		case int64:
			return float64(x), nil
		}
	case kindInt:
		switch x := v.(type) {
		case int64:
			return x, nil
		case float64:
			if x == math.Trunc(x) && !math.IsInf(x, 0) && math.Abs(x) < 1<<53 {
				return nil, fmt.Errorf("must be an integer for %s; write %d without a decimal point", k.text, int64(x))
			}
			return nil, fmt.Errorf("must be an integer for %s, not %s", k.text, fmtValue(x))
		}
	case kindString:
		if _, ok := v.(string); ok {
			return v, nil
		}
		return nil, fmt.Errorf("must be a string for %s, not %s; put it in double quotes", k.text, tomlType(v))
	case kindBool:
		if _, ok := v.(bool); ok {
			return v, nil
		}
	case kindStrings:
		if a, ok := v.([]any); ok {
			for i, e := range a {
				if _, ok := e.(string); !ok {
					return nil, fmt.Errorf("must be an array of strings for %s; its %s entry is %s", k.text, ordinal(i+1), tomlType(e))
				}
			}
			return v, nil
		}
		if s, ok := v.(string); ok {
			return nil, fmt.Errorf("must be an array of strings for %s; write [%q] for a list of one", k.text, s)
		}
	case kindRows:
		if a, ok := v.([]any); ok {
			for i, e := range a {
				if _, ok := e.([]any); !ok {
					return nil, fmt.Errorf("must be an array of rows for %s, e.g. [[0.0, 4.0], [0.2, 4.0]]; its %s entry is %s", k.text, ordinal(i+1), tomlType(e))
				}
			}
			return v, nil
		}
	}
	return nil, fmt.Errorf("must be %s for %s, not %s", k.leaf.kind, k.text, tomlType(v))
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
