package casefile

import (
	"path/filepath"
	"reflect"
	"strings"

	"rollerbed/io/stricttoml"
)

// File names in a case (canopy.profile_file) are relative to the folder of
// the case file. Such a key is a string field tagged `path:"relative"`;
// Load, runs.FromCase and sweep plans all find the keys through that tag,
// so a new file key is one tag.

// FileKeys returns the dotted keys of the case file that hold file names
// relative to the case file's folder; an element of an array of tables
// is named without its index.
func FileKeys() []string {
	var out []string
	var walk func(f *stricttoml.Field, prefix string)
	walk = func(f *stricttoml.Field, prefix string) {
		for _, sub := range f.Fields {
			key := prefix + stricttoml.Component(sub.Name)
			if sub.Kind.IsTable() {
				walk(sub, key+".")
			} else if isFileField(f.Type, sub) {
				out = append(out, key)
			}
		}
	}
	walk(stricttoml.SchemaOf(reflect.TypeOf(Case{})).Root, "")
	return out
}

// isFileField reports whether the field sub of the struct type t holds a
// relative file name.
func isFileField(t reflect.Type, sub *stricttoml.Field) bool {
	if t.Kind() == reflect.Pointer || t.Kind() == reflect.Slice {
		t = t.Elem()
	}
	return t.Field(sub.Index).Tag.Get("path") == "relative"
}

// ResolvePath returns the file name name, relative to the folder dir,
// as a name relative to the working folder: name itself when it is
// absolute, empty, or dir is "".
func ResolvePath(name, dir string) string {
	if name == "" || dir == "" || filepath.IsAbs(name) {
		return name
	}
	return filepath.Join(dir, name)
}

// resolvePaths makes the relative file names of a case read from file
// relative to the folder that holds it. Text given to Parse has no folder,
// and its names stay as written.
func resolvePaths(c *Case, file string) {
	if file == "" {
		return
	}
	resolveIn(reflect.ValueOf(c).Elem(), filepath.Dir(file))
}

// resolveIn resolves the tagged file names of the struct v, and of the
// tables it holds, against dir.
func resolveIn(v reflect.Value, dir string) {
	t := v.Type()
	for i := 0; i < t.NumField(); i++ {
		sf, fv := t.Field(i), v.Field(i)
		if !sf.IsExported() || strings.HasPrefix(sf.Tag.Get("toml"), "-") {
			continue
		}
		switch {
		case sf.Tag.Get("path") == "relative" && fv.Kind() == reflect.String:
			fv.SetString(ResolvePath(fv.String(), dir))
		case fv.Kind() == reflect.Struct:
			resolveIn(fv, dir)
		case fv.Kind() == reflect.Pointer && !fv.IsNil() && fv.Elem().Kind() == reflect.Struct:
			resolveIn(fv.Elem(), dir)
		case fv.Kind() == reflect.Slice && fv.Type().Elem().Kind() == reflect.Struct:
			for j := 0; j < fv.Len(); j++ {
				resolveIn(fv.Index(j), dir)
			}
		}
	}
}
