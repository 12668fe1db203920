package stricttoml

import (
	"reflect"
	"strings"
	"sync"
)

// Kind is the type a key of the schema holds.
type Kind int

// Kinds of schema keys, from the Go type of the struct field.
const (
	Table   Kind = iota // a struct, or a pointer to one (an optional table): [table]
	Tables              // a slice of structs: [[table]], or inline [{...}, {...}]
	Float               // float64; integers are accepted
	Int                 // int or int64
	String              // string
	Bool                // bool
	Strings             // []string: an array of strings
	Ints                // []int64: an array of integers
	Rows                // [][N]float64: an array of rows of N numbers
	Any                 // any: the decoded TOML value as it is, for the file kind to check
	Other               // a type the decoder cannot fill (a bug in the schema)
)

// String names the kind with an article, as messages say what a key must
// be: "a number", "an array of strings".
func (k Kind) String() string {
	switch k {
	case Table:
		return "a table"
	case Tables:
		return "an array of tables"
	case Float:
		return "a number"
	case Int:
		return "an integer"
	case String:
		return "a string"
	case Bool:
		return "true or false"
	case Strings:
		return "an array of strings"
	case Ints:
		return "an array of integers"
	case Rows:
		return "an array of rows of numbers"
	case Any:
		return "a value"
	}
	return "a value of another type"
}

// IsTable reports whether the kind is a table or an array of tables.
func (k Kind) IsTable() bool { return k == Table || k == Tables }

// Field is one key of a schema: a tagged field of a struct.
type Field struct {
	// Name is the TOML key, from the field's toml tag.
	Name string
	Kind Kind
	// Index is the field's index in its struct.
	Index int
	// Row is how a row of a Rows key reads in messages ("[z, a]"), from
	// the field's row tag.
	Row string
	// Example is a line to suggest for the key in messages
	// (`base = "flume.toml"`), from the field's example tag; "" for the
	// decoder's own.
	Example string
	// Type is the field's Go type.
	Type reflect.Type
	// Fields are the keys of a table, or of each element of an array of
	// tables, in field order.
	Fields []*Field
	byName map[string]*Field
}

// Key returns the key name of a table field, or nil.
func (f *Field) Key(name string) *Field { return f.byName[name] }

// Schema is the tree of keys of a document type.
type Schema struct {
	// Root is the document itself, a table.
	Root *Field
	// keys are the dotted keys below the root, tables before the keys
	// they hold, in field order.
	keys []string
	// names maps the last component of every key below the root to the
	// dotted keys that end in it, for "did you mean" suggestions.
	names map[string][]string
}

var schemas sync.Map // reflect.Type → *Schema

// SchemaOf returns the schema of the struct type t, read from its toml
// tags (fields tagged "-", untagged or unexported are not part of it). It
// is built once per type.
func SchemaOf(t reflect.Type) *Schema {
	if s, ok := schemas.Load(t); ok {
		return s.(*Schema)
	}
	if t.Kind() != reflect.Struct {
		panic("stricttoml: SchemaOf needs a struct type, not " + t.String())
	}
	s := &Schema{Root: tableField(t), names: map[string][]string{}}
	s.index(s.Root, nil)
	actual, _ := schemas.LoadOrStore(t, s)
	return actual.(*Schema)
}

func (s *Schema) index(f *Field, prefix []string) {
	for _, sub := range f.Fields {
		path := append(append([]string{}, prefix...), Component(sub.Name))
		s.keys = append(s.keys, KeyString(path))
		s.names[sub.Name] = append(s.names[sub.Name], KeyString(path))
		if sub.Kind.IsTable() {
			s.index(sub, path)
		}
	}
}

// tableField makes the field of the struct type t, with its keys.
func tableField(t reflect.Type) *Field {
	f := &Field{Kind: Table, Type: t, byName: map[string]*Field{}}
	for i := 0; i < t.NumField(); i++ {
		sf := t.Field(i)
		name, _, _ := strings.Cut(sf.Tag.Get("toml"), ",")
		if name == "" || name == "-" || !sf.IsExported() {
			continue
		}
		sub := fieldOf(sf.Type)
		sub.Name, sub.Index, sub.Type = name, i, sf.Type
		sub.Row, sub.Example = sf.Tag.Get("row"), sf.Tag.Get("example")
		f.Fields = append(f.Fields, sub)
		f.byName[name] = sub
	}
	return f
}

// fieldOf makes the field of a value of type t, with its keys when it is a
// table.
func fieldOf(t reflect.Type) *Field {
	switch t.Kind() {
	case reflect.Struct:
		return tableField(t)
	case reflect.Pointer:
		if t.Elem().Kind() == reflect.Struct {
			return tableField(t.Elem())
		}
	case reflect.Slice:
		switch el := t.Elem(); {
		case el.Kind() == reflect.Struct:
			f := tableField(el)
			f.Kind = Tables
			return f
		case el.Kind() == reflect.String:
			return &Field{Kind: Strings}
		case el.Kind() == reflect.Int64:
			return &Field{Kind: Ints}
		case el.Kind() == reflect.Array && el.Elem().Kind() == reflect.Float64:
			return &Field{Kind: Rows}
		}
	case reflect.Float64:
		return &Field{Kind: Float}
	case reflect.Int, reflect.Int64:
		return &Field{Kind: Int}
	case reflect.String:
		return &Field{Kind: String}
	case reflect.Bool:
		return &Field{Kind: Bool}
	case reflect.Interface:
		if t.NumMethod() == 0 {
			return &Field{Kind: Any}
		}
	}
	return &Field{Kind: Other}
}

// Elsewhere returns the dotted keys of the schema whose last component is
// name, in field order.
func (s *Schema) Elsewhere(name string) []string { return s.names[name] }

// Keys returns every dotted key of the schema (elements of arrays of
// tables without an index), tables before the keys they hold, in field
// order.
func (s *Schema) Keys() []string { return append([]string(nil), s.keys...) }
