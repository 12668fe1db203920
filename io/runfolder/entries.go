package runfolder

import (
	"bytes"
	"encoding/json"
	"errors"
	"fmt"
	"io"
	"strconv"
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

// ReadEntries reads summary.json of run folder dir flattened into entries,
// in the order of the text; readers that show every key (the summary
// table, comparisons, sweep tables) use it.
func ReadEntries(dir string) ([]Entry, error) {
	return readSummaryAs(dir, FlattenJSON)
}
