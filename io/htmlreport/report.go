package htmlreport

import (
	"bytes"
	"embed"
	"encoding/base64"
	"errors"
	"fmt"
	"html/template"
	"os"
	"path/filepath"
	"slices"
	"strings"
	"time"

	"rollerbed/io/runfolder"
)

//go:embed templates
var templateFiles embed.FS

var templates = template.Must(template.New("").ParseFS(templateFiles, "templates/*.html"))

// Caution is the caution every report carries, as the README words it.
const Caution = "rollerbed is a research and teaching model, not a design or permitting tool. " +
	"A 2-D slice cannot carry the three-dimensional breakdown of the canopy-top rollers: they stay more coherent, pair and grow further than in real flows, " +
	"so mixing lengths and roller spacings are biased (typically larger) compared with flumes and field sites. " +
	"The drag and uptake laws are parameterisations with stated ranges of validity. " +
	"For any decision that affects structures, intakes, restoration works, discharges, people or property, " +
	"defer to site measurements, local codes and licensed engineering practice."

// figureOrder is the order of the known figures in a report; others
// follow in name order.
var figureOrder = []string{"vorticity.png", "rollers.gif", "profiles.png", "spectrum.png", "spectra.png", "timeseries.png", "scalars.png", "uptake.png"}

// Figure is one embedded figure of a report.
type Figure struct {
	Name    string
	Caption string
	Data    template.URL // data URI
}

// Row is one line of a report's summary table.
type Row struct {
	Key, Value, Unit string
	Numeric          bool // right-aligned
}

// runPage is what the run report's template shows.
type runPage struct {
	Title      string
	Dir        string
	Written    string
	State      string
	Error      string
	Caution    string
	Warnings   []string
	Rows       []Row
	Figures    []Figure
	Case       string
	Provenance []Row
	Missing    []string // what the folder lacks, said plainly
}

// Write writes report.html into the run folder dir and returns its path:
// the summary table (when summary.json is there), the warnings, every
// figure of dir/figures, the case as run and the cautions. A folder
// without a summary or figures yet (a run still going) gets a report
// that says what is missing.
func Write(dir string) (string, error) {
	if err := runfolder.Check(dir); err != nil {
		return "", err
	}
	p := runPage{Title: filepath.Base(filepath.Clean(dir)), Dir: dir, Written: time.Now().UTC().Format("2006-01-02 15:04 UTC"), Caution: Caution}
	if sum, err := runfolder.ReadSummary(dir); err == nil {
		if sum.Run.Title != "" {
			p.Title = sum.Run.Title
		}
		p.Warnings = sum.Run.Warnings
		p.Error = sum.Run.Error
		switch {
		case sum.Run.Error != "":
			p.State = "stopped by an error"
		case sum.Run.Interrupted:
			p.State = "interrupted (resume it with rollerbed run --resume " + dir + ")"
		default:
			p.State = "finished"
		}
		if pv := sum.Provenance; pv != nil {
			for _, f := range pv.Facts() {
				p.Provenance = append(p.Provenance, Row{Key: f.Label, Value: *f.Value})
			}
		}
	} else {
		p.State = "no summary yet"
		p.Missing = append(p.Missing, fmt.Sprintf("%s is missing: the run has not ended yet (or stopped before writing it), so the report has no summary table", runfolder.SummaryFile))
	}
	if es, err := runfolder.ReadEntries(dir); err == nil {
		for _, e := range es {
			if strings.HasPrefix(e.Key, "provenance.") {
				continue
			}
			_, num := e.Number()
			p.Rows = append(p.Rows, Row{Key: e.Key, Value: runfolder.FormatValue(e.Value), Unit: runfolder.UnitCell(e), Numeric: num || e.Value == nil})
		}
	}
	if text, err := os.ReadFile(filepath.Join(dir, runfolder.CaseFile)); err == nil {
		p.Case = string(text)
	}
	figs, err := readFigures(filepath.Join(dir, runfolder.FiguresDir), false)
	if err != nil {
		return "", err
	}
	p.Figures = figs
	if len(figs) == 0 {
		p.Missing = append(p.Missing, "the figures folder holds no figures yet: write them with rollerbed report "+dir)
	}
	path := filepath.Join(dir, runfolder.ReportFile)
	return path, render(path, "run.html", p)
}

// comparePage is what the comparison report's template shows.
type comparePage struct {
	Written string
	Caution string
	Runs    []compareRun
	Heads   []string // value columns: each run, and "÷ first" after each but the first
	Rows    []compareRow
	Figures []Figure
}

type compareRun struct{ Label, Dir, Title string }

type compareRow struct {
	Key, Unit string
	Cells     []string
}

// WriteComparison writes report.html into outDir for the comparison cmp
// (see runfolder.Compare), with the overlay figures among figures (paths
// of PNG files) embedded, and returns its path.
func WriteComparison(cmp *runfolder.Comparison, figures []string, outDir string) (string, error) {
	p := comparePage{Written: time.Now().UTC().Format("2006-01-02 15:04 UTC"), Caution: Caution}
	for i, r := range cmp.Runs {
		p.Runs = append(p.Runs, compareRun{Label: r, Dir: cmp.Dirs[i], Title: cmp.Titles[i]})
		p.Heads = append(p.Heads, r)
		if i > 0 {
			p.Heads = append(p.Heads, "÷ first")
		}
	}
	for _, row := range cmp.Rows {
		r := compareRow{Key: row.Key, Unit: row.Unit}
		if r.Unit == "" {
			r.Unit = "–"
		}
		for i, v := range row.Values {
			r.Cells = append(r.Cells, runfolder.FormatValue(deref(v)))
			if i > 0 {
				r.Cells = append(r.Cells, runfolder.FormatValue(deref(row.RatioToFirst[i])))
			}
		}
		p.Rows = append(p.Rows, r)
	}
	for _, path := range figures {
		f, err := embedFigure(path, true)
		if err != nil {
			return "", err
		}
		p.Figures = append(p.Figures, f)
	}
	sortFigures(p.Figures)
	if err := os.MkdirAll(outDir, 0o755); err != nil {
		return "", fmt.Errorf("htmlreport: cannot create %s: %v", outDir, err)
	}
	path := filepath.Join(outDir, runfolder.ReportFile)
	return path, render(path, "compare.html", p)
}

// deref returns *v, or nil (shown as "–") for nil.
func deref(v *float64) any {
	if v == nil {
		return nil
	}
	return *v
}

// readFigures embeds every PNG and GIF of the folder dir; a missing
// folder gives none.
func readFigures(dir string, comparison bool) ([]Figure, error) {
	ents, err := os.ReadDir(dir)
	if errors.Is(err, os.ErrNotExist) {
		return nil, nil
	}
	if err != nil {
		return nil, fmt.Errorf("htmlreport: cannot read the figures: %v", err)
	}
	var out []Figure
	for _, e := range ents {
		if !e.Type().IsRegular() || mediaType(e.Name()) == "" {
			continue
		}
		f, err := embedFigure(filepath.Join(dir, e.Name()), comparison)
		if err != nil {
			return nil, err
		}
		out = append(out, f)
	}
	sortFigures(out)
	return out, nil
}

// embedFigure reads an image file into a Figure.
func embedFigure(path string, comparison bool) (Figure, error) {
	name := filepath.Base(path)
	typ := mediaType(name)
	if typ == "" {
		return Figure{}, fmt.Errorf("htmlreport: %s is neither a PNG nor a GIF image", path)
	}
	b, err := os.ReadFile(path)
	if err != nil {
		return Figure{}, fmt.Errorf("htmlreport: cannot read the figure: %v", err)
	}
	uri := "data:" + typ + ";base64," + base64.StdEncoding.EncodeToString(b)
	// The URI is built here from the file's bytes in base64, so it holds
	// nothing a browser could run.
	return Figure{Name: name, Caption: captionFor(name, comparison), Data: template.URL(uri)}, nil
}

// mediaType returns the media type of an image file by its extension, ""
// for other files.
func mediaType(name string) string {
	switch strings.ToLower(filepath.Ext(name)) {
	case ".png":
		return "image/png"
	case ".gif":
		return "image/gif"
	}
	return ""
}

// sortFigures puts the known figures first in figureOrder, the others
// after them by name.
func sortFigures(fs []Figure) {
	rank := func(n string) int {
		if i := slices.Index(figureOrder, n); i >= 0 {
			return i
		}
		return len(figureOrder)
	}
	slices.SortStableFunc(fs, func(a, b Figure) int {
		if ra, rb := rank(a.Name), rank(b.Name); ra != rb {
			return ra - rb
		}
		return strings.Compare(a.Name, b.Name)
	})
}

// render executes the template name with data and writes the result to
// path atomically.
func render(path, name string, data any) error {
	var buf bytes.Buffer
	if err := templates.ExecuteTemplate(&buf, name, data); err != nil {
		panic("htmlreport: template " + name + ": " + err.Error())
	}
	return runfolder.WriteFileAtomic(path, buf.Bytes())
}
