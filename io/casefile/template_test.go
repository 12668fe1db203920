package casefile

import (
	"errors"
	"io/fs"
	"os"
	"path/filepath"
	"reflect"
	"regexp"
	"strings"
	"testing"

	"rollerbed/io/stricttoml"
)

func TestTemplateParses(t *testing.T) {
	c, err := Parse([]byte(Template()))
	if err != nil {
		t.Fatalf("Template() does not parse:\n%v", err)
	}
	// The demo scenario: a seagrass meadow of blades 0.25 m tall in an open
	// channel of seawater 2 m long, 0.5 m deep, started drag-balanced.
	if c.Domain.Length != 2 || c.Domain.Depth != 0.5 || c.Fluid.Preset != "seawater-20C" || c.Top.Condition != FreeSlip {
		t.Errorf("template scenario changed: %+v", c)
	}
	want := Canopy{Height: 0.25, FrontalArea: 4, Shape: ShapeBlade, Diameter: 0.005, DragCoefficient: 1, DragLaw: DragFixed}
	if c.Canopy == nil || !reflect.DeepEqual(*c.Canopy, want) {
		t.Errorf("template canopy %+v, want %+v", c.Canopy, want)
	}
	if c.Initial.Profile != ProfileDragBalanced || c.Turbulence != (Turbulence{Closure: ClosureSmagorinsky, Smagorinsky: 0.2}) {
		t.Errorf("template initial %+v turbulence %+v", c.Initial, c.Turbulence)
	}
	if c.Domain.Cluster.At != c.Canopy.Height || c.Initial.PerturbationAt != c.Canopy.Height {
		t.Errorf("template clusters cells at %g m and perturbs at %g m, not at the canopy top %g m", c.Domain.Cluster.At, c.Initial.PerturbationAt, c.Canopy.Height)
	}
	if c.Scalars != nil {
		t.Errorf("template scalars %+v, want none: the [[scalar]] example is commented out", c.Scalars)
	}
	if err := c.Validate(); err != nil {
		t.Errorf("template case does not validate: %v", err)
	}
}

// templateKeys returns every key the template sets or shows commented out
// ("# key = ..."), with tables from "[table]" and "[[table]]" headers, as
// dotted keys.
func templateKeys(text string) map[string]bool {
	header := regexp.MustCompile(`^#?\s*\[\[?([A-Za-z0-9_.-]+)\]\]?\s*(#.*)?$`)
	assign := regexp.MustCompile(`^#?\s*([A-Za-z0-9_-]+)\s*=`)
	keys := map[string]bool{}
	table := ""
	for _, line := range strings.Split(text, "\n") {
		if m := header.FindStringSubmatch(line); m != nil {
			table = m[1]
			keys[table] = true
			continue
		}
		if m := assign.FindStringSubmatch(line); m != nil {
			key := m[1]
			if table != "" {
				key = table + "." + key
			}
			keys[key] = true
		}
	}
	return keys
}

func TestTemplateMentionsEveryKey(t *testing.T) {
	keys := templateKeys(Template())
	schema := stricttoml.SchemaOf(reflect.TypeOf(Case{})).Keys()
	if len(schema) < 40 {
		t.Fatalf("schema walk found only %d keys", len(schema))
	}
	for _, k := range schema {
		if !keys[k] {
			t.Errorf("the template does not document %s", k)
		}
	}
	// And the template mentions nothing the schema does not know.
	known := map[string]bool{}
	for _, k := range schema {
		known[k] = true
	}
	for k := range keys {
		if !known[k] {
			t.Errorf("the template shows %s, which is not in the schema", k)
		}
	}
}

func TestTemplateListsPresets(t *testing.T) {
	tmpl := Template()
	for _, name := range FluidPresets() {
		nu, _ := FluidPreset(name)
		if !regexp.MustCompile(`#\s+` + regexp.QuoteMeta(name) + `\s+` + regexp.QuoteMeta(stricttoml.FormatFloat(nu)) + `\s`).MatchString(tmpl) {
			t.Errorf("the template does not list preset %s with %s m²/s", name, stricttoml.FormatFloat(nu))
		}
	}
}

func TestTemplateStatesUnits(t *testing.T) {
	// Every dimensional key's comment block names its unit.
	units := map[string]string{
		"domain.length": "m.", "domain.depth": "m.", "fluid.viscosity": "m²/s",
		"bed.roughness": "m.", "forcing.gradient": "m/s²", "forcing.bulk_velocity": "m/s",
		"time.duration": "s.", "output.profile_every": "s.",
		"canopy.height": "m.", "canopy.frontal_area": "1/m", "canopy.diameter": "m.",
		"canopy.edge_width": ", m", "canopy.linear_rate": "1/s", "canopy.patch.start": ", m.", "canopy.patch.end": ", m.",
		"time.spin_up": "s:", "output.snapshot_every": ", s.", "output.checkpoint_every": ", s.",
		"output.checkpoint_wall_minutes": "minutes", "output.probes": "(m/s)",
		"scalar.diffusivity": "m²/s", "scalar.initial": "unit.", "scalar.source": "unit/s", "scalar.top_value": "unit·m/s",
		"scalar.bed_value": "unit·m/s", "scalar.bed_capacity": ", m/s", "scalar.capacity": ", m/s", "scalar.power_alpha": "m^(1-n)·s^(n-1)",
		"scalar.surface_concentration": "unit.",
	}
	lines := strings.Split(Template(), "\n")
	for key, unit := range units {
		name := key[strings.LastIndex(key, ".")+1:]
		found := false
		for i, line := range lines {
			if regexp.MustCompile(`^#?\s*` + name + `\s*=`).MatchString(line) {
				for j := max(0, i-3); j < i; j++ {
					found = found || strings.Contains(lines[j], unit)
				}
			}
		}
		if !found {
			t.Errorf("the comment above %s does not state its unit %q", key, unit)
		}
	}
}

func TestWriteTemplate(t *testing.T) {
	path := filepath.Join(t.TempDir(), "meadow.toml")
	if err := WriteTemplate(path); err != nil {
		t.Fatal(err)
	}
	got, err := os.ReadFile(path)
	if err != nil || string(got) != Template() {
		t.Fatalf("written file differs from Template() (%v)", err)
	}
	if _, err := Load(path); err != nil {
		t.Errorf("written template does not load: %v", err)
	}
}

func TestWriteTemplateRefusesToOverwrite(t *testing.T) {
	path := filepath.Join(t.TempDir(), "meadow.toml")
	const mine = "# my own case, not to be lost\n"
	if err := os.WriteFile(path, []byte(mine), 0o644); err != nil {
		t.Fatal(err)
	}
	err := WriteTemplate(path)
	if err == nil {
		t.Fatal("WriteTemplate overwrote an existing file")
	}
	for _, part := range []string{path, "already exists", "choose another file name"} {
		if !strings.Contains(err.Error(), part) {
			t.Errorf("error %q does not contain %q", err, part)
		}
	}
	if got, _ := os.ReadFile(path); string(got) != mine {
		t.Error("the existing file was changed")
	}
}

func TestWriteTemplateBadDirectory(t *testing.T) {
	err := WriteTemplate(filepath.Join(t.TempDir(), "no", "such", "dir", "meadow.toml"))
	if err == nil || !errors.Is(err, fs.ErrNotExist) {
		t.Errorf("got %v, want a wrapped not-exist error", err)
	}
}
