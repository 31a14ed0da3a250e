package report

import (
	"bytes"
	"encoding/json"
	"errors"
	"math"
	"os"
	"path/filepath"
	"strings"
	"testing"
)

// artifactDir is where tests leave files for a person to look at: $UNDERCURRENT_ARTIFACTS,
// or a temporary directory.
func artifactDir(t testing.TB) string {
	if d := os.Getenv("UNDERCURRENT_ARTIFACTS"); d != "" {
		if err := os.MkdirAll(d, 0o755); err != nil {
			t.Fatal(err)
		}
		return d
	}
	return t.TempDir()
}

func TestRenderSample(t *testing.T) {
	d := Sample(SampleSettings{Hostile: true, Seed: 7})
	var a, b bytes.Buffer
	if err := Render(&a, d); err != nil {
		t.Fatal(err)
	}
	if err := Render(&b, Sample(SampleSettings{Hostile: true, Seed: 7})); err != nil {
		t.Fatal(err)
	}
	if !bytes.Equal(a.Bytes(), b.Bytes()) {
		t.Fatal("two renders of the same data differ")
	}
	page := strings.Replace(a.String(), echartsJS, "", 1)
	for _, bad := range []string{HostileScript, HostileImg, "<img src=x", "src=\"http", "src=http", "https://cdn", "@import", "url("} {
		if strings.Contains(page, bad) {
			t.Errorf("page contains %q", bad)
		}
	}
	// Every hit segment of a shown example is marked, and only those; every label a
	// person chose carries the badge.
	hits, people := 0, 0
	for _, th := range d.Themes {
		for _, e := range th.Examples[:min(5, len(th.Examples))] {
			for _, s := range e.Segments {
				if s.Hit {
					hits++
				}
			}
		}
		if th.LabelByPerson {
			people++
		}
	}
	for _, g := range d.Copies.Listed {
		for _, s := range g.Example.Segments {
			if s.Hit {
				hits++
			}
		}
	}
	if n := strings.Count(page, "<mark>"); n != hits {
		t.Errorf("%d <mark> elements, want %d hit segments", n, hits)
	}
	if n := strings.Count(page, `<span class="uc-badge uc-person">named by a person</span>`); n != people {
		t.Errorf("%d person badges on theme sections, want %d", n, people)
	}
	// A theme of which a quarter or more repeats one text says so (the sample's smallest,
	// 37%), and no other does.
	warned := 0
	for _, th := range d.Themes {
		if th.Copies != "" && !th.CopiesWithheld && th.CopiesShare >= 0.25 {
			warned++
		}
	}
	if n := strings.Count(page, "of the narratives with this as their strongest theme repeat one text"); n != warned || warned != 1 {
		t.Errorf("%d repeated-text warnings, want %d (and the sample to have one)", n, warned)
	}
	path := filepath.Join(artifactDir(t), "sample-report.html")
	if err := WriteFile(path, d); err != nil {
		t.Fatal(err)
	}
	t.Logf("sample report: %s (%d bytes)", path, a.Len())
}

func TestValidate(t *testing.T) {
	for _, tc := range []struct {
		name string
		edit func(d *Data)
		want string
	}{
		{"duplicate theme", func(d *Data) { d.Themes[1].ID = d.Themes[0].ID }, "theme 0 appears twice"},
		{"merge of a future cluster", func(d *Data) { d.Tree.Merges[0].Left = len(d.Tree.Leaves) + 3 }, "does not exist yet"},
		{"cluster merged twice", func(d *Data) { d.Tree.Merges[1] = d.Tree.Merges[0]; d.Tree.Merges[1].Height = d.Tree.Merges[2].Height }, "merged twice"},
		{"height falls", func(d *Data) { d.Tree.Merges[2].Height = -1 }, "below the previous merge"},
		{"bad month", func(d *Data) { d.Themes[0].Months[2].Month = "2023-13" }, `"2023-13" is not YYYY-MM`},
		{"months out of order", func(d *Data) { d.Themes[0].Months[2].Month = "2023-01" }, "2023-01 does not come after 2023-02"},
		{"NaN group", func(d *Data) { d.Themes[1].Groups[0].High = math.Inf(1) }, "Groups[0]: invalid report data: share or interval not finite"},
		{"NaN K measure", func(d *Data) { d.KChoice.Rows[1].NPMI = math.NaN() }, "KChoice.Rows[1]"},
		{"no label", func(d *Data) { d.Themes[2].Label = " " }, "has no label"},
		{"NaN share", func(d *Data) { d.Themes[0].Months[3].Share = math.NaN() }, "not finite"},
		{"mixture share count", func(d *Data) { d.Mixture.Columns[4].Shares = d.Mixture.Columns[4].Shares[1:] }, "Mixture.Columns[4].Shares"},
		{"mixture share above 1", func(d *Data) { d.Mixture.Columns[0].Shares[0] = 1.5 }, "not in [0, 1]"},
		{"copy similarity", func(d *Data) { d.Copies.Listed[1].LeastSimilarity = math.NaN() }, "Copies.Listed[1]"},
	} {
		d := Sample(SampleSettings{Themes: 5, Seed: 2})
		tc.edit(d)
		err := Validate(d)
		if err == nil || !strings.Contains(err.Error(), tc.want) || !errors.Is(err, ErrInvalid) {
			t.Errorf("%s: got %v, want an ErrInvalid containing %q", tc.name, err, tc.want)
		}
	}
	if err := Validate(Sample(SampleSettings{Seed: 2})); err != nil {
		t.Errorf("sample: %v", err)
	}
}

// A failed render leaves the previous report in place and no temporary file behind.
func TestWriteFileFailure(t *testing.T) {
	dir := t.TempDir()
	path := filepath.Join(dir, "report.html")
	if err := os.WriteFile(path, []byte("previous"), 0o644); err != nil {
		t.Fatal(err)
	}
	d := Sample(SampleSettings{Themes: 3})
	d.Themes[1].ID = d.Themes[0].ID
	if err := WriteFile(path, d); err == nil {
		t.Fatal("no error for invalid data")
	}
	if b, _ := os.ReadFile(path); string(b) != "previous" {
		t.Errorf("report overwritten: %q", b)
	}
	if ents, _ := os.ReadDir(dir); len(ents) != 1 {
		t.Errorf("directory holds %d entries, want 1", len(ents))
	}
}

// Everything from the data is escaped: a label and a narrative that hold markup appear
// as text in every context of the page (element text, attribute, chart options).
func TestEscaping(t *testing.T) {
	d := Sample(SampleSettings{Themes: 3, Hostile: true})
	d.Themes[0].Label = `"></a><svg onload=alert(1)> __f__function(){}__f__ </script><!--`
	d.Tree.Leaves[d.Themes[0].ID].Label = d.Themes[0].Label
	var buf bytes.Buffer
	if err := Render(&buf, d); err != nil {
		t.Fatal(err)
	}
	page := strings.Replace(buf.String(), echartsJS, "", 1)
	for _, bad := range []string{"<svg onload", "</script><!--", "<script>window.__pwned", "<img src=x"} {
		if strings.Contains(page, bad) {
			t.Errorf("page contains %q unescaped", bad)
		}
	}
	if n := strings.Count(strings.ToLower(page), "<script"); n != 3 {
		t.Errorf("%d script elements, want 3 (runtime, our script, the JSON block)", n)
	}
	// The chart options block is valid JSON.
	_, rest, _ := strings.Cut(page, `<script type="application/json" id="uc-charts">`)
	block, _, _ := strings.Cut(rest, "</script>")
	if !json.Valid([]byte(block)) {
		t.Error("chart options block is not valid JSON")
	}
	if !strings.Contains(page, "&lt;svg onload=alert(1)&gt;") || !strings.Contains(page, `\u003csvg onload=alert(1)\u003e`) {
		t.Error("label not found escaped as HTML text and as JS string")
	}
}

// An empty Data still renders a whole page (with the cautions), and a theme without
// months, groups or examples does not break it.
func TestRenderSparse(t *testing.T) {
	for name, d := range map[string]*Data{
		"empty":                        {},
		"suggestion of unknown themes": {Tree: Tree{Leaves: []TreeLeaf{{Theme: 0, Label: "a"}}, Suggestions: []MergeSuggestion{{A: 5, B: 6}}}},
		"bare themes":                  {Themes: []Theme{{ID: 0, Label: "a"}, {ID: 1, Label: "b", Months: []MonthPoint{{Month: "2024-01", Gap: true}}}}},
	} {
		var buf bytes.Buffer
		if err := Render(&buf, d); err != nil {
			t.Errorf("%s: %v", name, err)
			continue
		}
		if !strings.Contains(buf.String(), "check with counsel") || !strings.Contains(buf.String(), "</html>") {
			t.Errorf("%s: page incomplete", name)
		}
	}
}
