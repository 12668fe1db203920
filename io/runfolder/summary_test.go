package runfolder

import (
	"encoding/json"
	"reflect"
	"testing"
)

// TestSummaryProvenanceRoundTrip: the provenance object is written to
// summary.json and read back whole, every fact under the key Facts names.
func TestSummaryProvenanceRoundTrip(t *testing.T) {
	p := Provenance{Version: "0.2.0", Revision: "0123456789abcdef0123456789abcdef01234567",
		RevisionTime: "2024-06-10T17:00:00Z", Modified: "true", GoVersion: "go1.26.0", HDF5: "1.10.8",
		FFTW: "fftw-3.3.10-sse2-avx", Host: "node17", CommandLine: `rollerbed run "case 1.toml" --out runA`}
	dir := t.TempDir()
	if err := (&Summary{Run: RunSummary{Title: "flume A", Steps: 3}, Provenance: &p}).Write(dir); err != nil {
		t.Fatal(err)
	}
	got, err := ReadSummary(dir)
	if err != nil {
		t.Fatal(err)
	}
	if got.Provenance == nil || *got.Provenance != p {
		t.Fatalf("provenance read back as %+v, want %+v", got.Provenance, p)
	}
	es, err := ReadEntries(dir)
	if err != nil {
		t.Fatal(err)
	}
	flat := map[string]any{}
	for _, e := range es {
		flat[e.Key] = e.Value
	}
	for _, f := range p.Facts() {
		if v := flat["provenance."+f.Key]; v != *f.Value {
			t.Errorf("provenance.%s = %v, want %q", f.Key, v, *f.Value)
		}
	}
}

// TestProvenanceFactsCoverFields: Facts lists every field of Provenance
// once, under its JSON key.
func TestProvenanceFactsCoverFields(t *testing.T) {
	var p Provenance
	b, err := json.Marshal(p)
	if err != nil {
		t.Fatal(err)
	}
	var keys map[string]string
	if err := json.Unmarshal(b, &keys); err != nil {
		t.Fatal(err)
	}
	facts := p.Facts()
	if len(facts) != reflect.TypeOf(p).NumField() || len(facts) != len(keys) {
		t.Fatalf("%d facts, %d fields, %d JSON keys", len(facts), reflect.TypeOf(p).NumField(), len(keys))
	}
	for i, f := range facts {
		if _, ok := keys[f.Key]; !ok {
			t.Errorf("fact %q is no JSON key of Provenance", f.Key)
		}
		*f.Value = f.Key
		for _, g := range facts[:i] {
			if g.Value == f.Value {
				t.Errorf("facts %q and %q share a field", g.Key, f.Key)
			}
		}
	}
	b, _ = json.Marshal(p)
	if err := json.Unmarshal(b, &keys); err != nil {
		t.Fatal(err)
	}
	for k, v := range keys {
		if k != v {
			t.Errorf("JSON key %q holds the fact %q", k, v)
		}
	}
}
