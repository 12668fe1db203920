package runs

import (
	"os"
	"path/filepath"
	"strings"
	"testing"

	"rollerbed/io/casefile"
)

// TestTemplateProfileExample uncomments the canopy profile that the case
// template documents (rows from z = 0 at the bed), in place of its block,
// and checks that the case becomes a run; then the same rows as a
// profile_file. The template promises 0 <= z <= depth, counting from the
// bed (common practice, no source).
func TestTemplateProfileExample(t *testing.T) {
	var rows []string
	var b strings.Builder
	inProfile := false
	for _, line := range strings.Split(casefile.Template(), "\n") {
		switch {
		case strings.HasPrefix(line, "height = ") || strings.HasPrefix(line, "frontal_area = "):
			line = "# " + line
		case strings.HasPrefix(line, "# profile = ["):
			line, inProfile = strings.TrimPrefix(line, "# "), true
		case inProfile && strings.HasPrefix(line, "#   ["):
			line = strings.TrimPrefix(line, "# ")
			rows = append(rows, strings.Trim(strings.TrimSpace(line), "[],"))
		case inProfile && strings.HasPrefix(line, "# ]"):
			line, inProfile = "]", false
		}
		b.WriteString(line + "\n")
	}
	if len(rows) < 2 || !strings.HasPrefix(rows[0], "0") {
		t.Fatalf("the template's profile example changed: rows %q", rows)
	}
	c, err := casefile.Parse([]byte(b.String()))
	if err != nil {
		t.Fatalf("the template with its profile example: %v", err)
	}
	if _, err := FromCase(c, ""); err != nil {
		t.Fatalf("the template with its profile example: %v", err)
	}
	// The same rows in a CSV file.
	dir := t.TempDir()
	if err := os.WriteFile(filepath.Join(dir, "meadow.csv"), []byte(strings.Join(rows, "\n")+"\n"), 0o644); err != nil {
		t.Fatal(err)
	}
	text := strings.Replace(b.String(), "profile = [", "profile_file = \"meadow.csv\"\nunused = [", 1)
	i := strings.Index(text, "unused = [")
	text = text[:i] + text[i+strings.Index(text[i:], "\n]\n")+3:]
	c, err = casefile.Parse([]byte(text))
	if err != nil {
		t.Fatalf("the template with a profile file: %v", err)
	}
	if _, err := FromCase(c, dir); err != nil {
		t.Fatalf("the template with a profile file: %v", err)
	}
}
