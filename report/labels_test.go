package report

import (
	"bytes"
	"errors"
	"fmt"
	"math"
	"strings"
	"testing"
)

func TestParseLabels(t *testing.T) {
	src := "\uFEFF# reviewer: invented example\n" +
		"theme 3: label = Parking complaints\n" +
		"  theme 3 : note =  Checked 40 narratives  \n" +
		"\n" +
		"theme 0: description = Blocked driveways = cars on the pavement\n" +
		"merge 4 into 7\n" +
		"merge 7 into 9\n" +
		"hide 2\n" +
		"theme 5: label = Bruit à Rue Émile\n"
	c, err := ParseLabels("labels.txt", strings.NewReader(src))
	if err != nil {
		t.Fatal(err)
	}
	want := []Statement{
		{Kind: SetLabel, Theme: 3, Text: "Parking complaints", Pos: Pos{2, 1}, ThemePos: Pos{2, 7}},
		{Kind: SetNote, Theme: 3, Text: "Checked 40 narratives", Pos: Pos{3, 3}, ThemePos: Pos{3, 9}},
		{Kind: SetDescription, Theme: 0, Text: "Blocked driveways = cars on the pavement", Pos: Pos{5, 1}, ThemePos: Pos{5, 7}},
		{Kind: Merge, Theme: 4, Into: 7, Pos: Pos{6, 1}, ThemePos: Pos{6, 7}, IntoPos: Pos{6, 14}},
		{Kind: Merge, Theme: 7, Into: 9, Pos: Pos{7, 1}, ThemePos: Pos{7, 7}, IntoPos: Pos{7, 14}},
		{Kind: Hide, Theme: 2, Pos: Pos{8, 1}, ThemePos: Pos{8, 6}},
		{Kind: SetLabel, Theme: 5, Text: "Bruit à Rue Émile", Pos: Pos{9, 1}, ThemePos: Pos{9, 7}},
	}
	if len(c.Statements) != len(want) {
		t.Fatalf("got %d statements, want %d: %+v", len(c.Statements), len(want), c.Statements)
	}
	for i := range want {
		if c.Statements[i] != want[i] {
			t.Errorf("statement %d:\n got %+v\nwant %+v", i, c.Statements[i], want[i])
		}
	}

	m, err := c.Map(10)
	if err != nil {
		t.Fatal(err)
	}
	wantInto := []int{0, 1, 2, 3, 9, 5, 6, 9, 8, 9}
	for i, v := range wantInto {
		if m.Into[i] != v {
			t.Errorf("Into[%d] = %d, want %d", i, m.Into[i], v)
		}
	}
	if !m.Hidden[2] || m.Hidden[3] {
		t.Errorf("Hidden = %v", m.Hidden)
	}
	theta := []float64{.1, .05, .05, .2, .1, 0, .1, .15, .05, .2}
	got := m.Fold(nil, theta)
	wantFold := []float64{.1, .05, .05, .2, 0, 0, .1, 0, .05, .45}
	var sum float64
	for i := range got {
		sum += got[i]
		if math.Abs(got[i]-wantFold[i]) > 1e-15 {
			t.Errorf("Fold[%d] = %v, want %v", i, got[i], wantFold[i])
		}
	}
	if math.Abs(sum-1) > 1e-12 {
		t.Errorf("folded shares sum to %v, want 1", sum)
	}
}

// Errors name file:line:col (the convention of Go's compilers and of encoding/csv's
// ParseError), with columns counted in characters.
func TestParseLabelsErrors(t *testing.T) {
	for _, tc := range []struct {
		src, want string
		is        error
	}{
		{"theme x: label = a", "l.txt:1:7: syntax error: theme number \"x\" is not a whole number 0 or above", ErrLabelsSyntax},
		{"theme -1: label = a", "l.txt:1:7: syntax error: theme number \"-1\"", ErrLabelsSyntax},
		{"theme 3 label = a", "l.txt:1:9: syntax error: expected \":\" after the theme number", ErrLabelsSyntax},
		{"theme 3: name = a", "l.txt:1:10: syntax error: unknown field \"name\"", ErrLabelsSyntax},
		{"theme 3: label a", "l.txt:1:16: syntax error: expected \"=\" after label", ErrLabelsSyntax},
		{"theme 3: label =   ", "l.txt:1:20: syntax error: empty label", ErrLabelsSyntax},
		{"# ok\n  rename 3 to x", "l.txt:2:3: syntax error: unknown statement \"rename\"", ErrLabelsSyntax},
		{"merge 4 onto 7", "l.txt:1:9: syntax error: expected \"into\", found \"onto\"", ErrLabelsSyntax},
		{"merge 4 into", "l.txt:1:13: syntax error: expected a theme number", ErrLabelsSyntax},
		{"hide 4 5", "l.txt:1:8: syntax error: unexpected \"5\"", ErrLabelsSyntax},
		{"theme é: label = a", "l.txt:1:7: syntax error: theme number \"é\"", ErrLabelsSyntax},
		{"théme 1: label = a", "l.txt:1:1: syntax error: unknown statement \"théme\"", ErrLabelsSyntax},
		{"theme 1: label = a\ntheme 1: label = b", "l.txt:2:1: conflicting statement: label for theme 1 already given on line 1", ErrLabelsConflict},
		{"merge 1 into 2\nmerge 1 into 3", "l.txt:2:1: conflicting statement: merge for theme 1 already given on line 1", ErrLabelsConflict},
		{"merge 1 into 1", "l.txt:1:14: conflicting statement: theme 1 merged into itself", ErrLabelsConflict},
		{"merge 1 into 2\nmerge 2 into 1", "l.txt:1:1: conflicting statement: merges starting at theme 1 go round in a loop", ErrLabelsConflict},
		{"merge 1 into 2\nhide 1", "l.txt:2:6: conflicting statement: theme 1 is merged into 2 on line 1; give the hide to theme 2", ErrLabelsConflict},
		{"theme 4: note = x\nmerge 4 into 2", "l.txt:1:7: conflicting statement: theme 4 is merged into 2 on line 2", ErrLabelsConflict},
		{"ok\xff", "l.txt:1:1: syntax error: line is not valid UTF-8", ErrLabelsSyntax},
	} {
		_, err := ParseLabels("l.txt", strings.NewReader(tc.src))
		if err == nil {
			t.Errorf("%q: no error, want %q", tc.src, tc.want)
			continue
		}
		if !strings.HasPrefix(err.Error(), tc.want) {
			t.Errorf("%q:\n got %q\nwant %q…", tc.src, err, tc.want)
		}
		var le *LabelsError
		if !errors.As(err, &le) || !errors.Is(err, tc.is) {
			t.Errorf("%q: error %v is not a *LabelsError wrapping %v", tc.src, err, tc.is)
		}
	}
}

func TestMapUnknownTheme(t *testing.T) {
	c, err := ParseLabels("l.txt", strings.NewReader("hide 1\nmerge 2 into 12"))
	if err != nil {
		t.Fatal(err)
	}
	_, err = c.Map(10)
	if err == nil || err.Error() != "l.txt:2:14: unknown theme: theme 12: the model has themes 0 to 9" || !errors.Is(err, ErrLabelsUnknownTheme) {
		t.Errorf("got %v", err)
	}
}

func TestFoldPanics(t *testing.T) {
	m := ThemeMap{Into: []int{0, 0}, Hidden: []bool{false, false}}
	for name, f := range map[string]func(){
		"short theta": func() { m.Fold(nil, []float64{1}) },
		"short dst":   func() { m.Fold(make([]float64, 1), []float64{1, 2}) },
		"same slice":  func() { x := []float64{1, 2}; m.Fold(x, x) },
	} {
		func() {
			defer func() {
				if r := recover(); r == nil || !strings.HasPrefix(r.(string), "report: ") {
					t.Errorf("%s: panic %v, want a \"report: \" panic", name, r)
				}
			}()
			f()
		}()
	}
}

func TestApply(t *testing.T) {
	d := Sample(SampleSettings{Seed: 3})
	byID := func(id int) *Theme {
		for i := range d.Themes {
			if d.Themes[i].ID == id {
				return &d.Themes[i]
			}
		}
		return nil
	}
	before4, before7, before9 := *byID(4), *byID(7), *byID(9)
	n := len(d.Themes)
	c, err := ParseLabels("review.txt", strings.NewReader(
		"theme 7: label = Arguments <b>at</b> home\ntheme 7: note = looked at 20\nmerge 4 into 7\nhide 9\n"))
	if err != nil {
		t.Fatal(err)
	}
	if err := Apply(d, c, nil); err != nil {
		t.Fatal(err)
	}
	if len(d.Themes) != n-2 || byID(4) != nil || byID(9) != nil {
		t.Fatalf("themes 4 and 9 should be gone: %d themes", len(d.Themes))
	}
	t7 := byID(7)
	if t7.Label != "Arguments <b>at</b> home" || !t7.LabelByPerson || t7.Note != "looked at 20" {
		t.Errorf("theme 7 not relabelled: %+v", t7)
	}
	if got, want := t7.Size.Expected, before4.Size.Expected+before7.Size.Expected; math.Abs(got-want) > 1e-9 {
		t.Errorf("merged expected size %v, want %v", got, want)
	}
	if len(t7.MergedFrom) != 1 || t7.MergedFrom[0] != 4 || t7.Months != nil || t7.SeriesNote == "" {
		t.Errorf("merge not recorded: MergedFrom %v, %d months, note %q", t7.MergedFrom, len(t7.Months), t7.SeriesNote)
	}
	if len(d.Hidden) != 1 || d.Hidden[0].ID != 9 || d.Hidden[0].Line != "review.txt:4" || d.Hidden[0].Size != before9.Size {
		t.Errorf("Hidden = %+v", d.Hidden)
	}
	if d.Tree.Leaves[4].Label != before4.Label+" (merged into 7)" {
		t.Errorf("tree leaf 4 = %q", d.Tree.Leaves[4].Label)
	}
	var buf bytes.Buffer
	if err := Render(&buf, d); err != nil {
		t.Fatal(err)
	}
	page := buf.String()
	hiddenSize := fmt.Sprintf("strongest theme of %s narratives", before9.Size.Dominant)
	for _, s := range []string{"Arguments &lt;b&gt;at&lt;/b&gt; home", "review.txt", "merged in by the reviewer", "Hidden by the reviewer", hiddenSize, "still count in every total"} {
		if !strings.Contains(page, s) {
			t.Errorf("page lacks %q", s)
		}
	}

	// With a recompute function the series come back.
	d = Sample(SampleSettings{Seed: 3})
	c, _ = ParseLabels("review.txt", strings.NewReader("merge 4 into 7\nmerge 5 into 7\n"))
	var gotFrom []int
	err = Apply(d, c, func(into int, from []int) ([]MonthPoint, []GroupShare, string, error) {
		gotFrom = from
		return []MonthPoint{{Month: "2023-01", Count: "12", Share: .1, Low: .05, High: .2}}, nil, "123", nil
	})
	if err != nil {
		t.Fatal(err)
	}
	if t7 := byID(7); len(gotFrom) != 2 || gotFrom[0] != 4 || gotFrom[1] != 5 || t7.Size.Dominant != "123" || len(t7.Months) != 1 {
		t.Errorf("recompute: from %v, theme 7 %+v", gotFrom, t7.Size)
	}

	// Theme numbers must be in the report.
	d = Sample(SampleSettings{Seed: 3, Themes: 5})
	c, _ = ParseLabels("review.txt", strings.NewReader("theme 1: label = a\nhide 8\n"))
	if err := Apply(d, c, nil); err == nil || !strings.HasPrefix(err.Error(), "review.txt:2:6: unknown theme") {
		t.Errorf("got %v", err)
	}
}

// FuzzParseLabels: any input gives a Curation or a *LabelsError whose position lies
// inside the input, and never a panic; a parsed file maps without error for a model
// large enough.
func FuzzParseLabels(f *testing.F) {
	for _, s := range []string{
		"theme 3: label = Parking\nmerge 4 into 7\nhide 9\n",
		"# c\n\ntheme 0: note = a = b\n",
		"merge 1 into 2\nmerge 2 into 1",
		"theme 99999999999999999999: label = x",
		"hide\t7\r\n",
	} {
		f.Add(s)
	}
	f.Fuzz(func(t *testing.T, src string) {
		c, err := ParseLabels("f.txt", strings.NewReader(src))
		if err != nil {
			var le *LabelsError
			if !errors.As(err, &le) {
				t.Fatalf("error %v is not a *LabelsError", err)
			}
			lines := strings.Count(src, "\n") + 1
			if le.Line < 1 || le.Line > lines+1 || le.Col < 1 {
				t.Fatalf("position %d:%d outside the input (%d lines): %v", le.Line, le.Col, lines, err)
			}
			return
		}
		k := 0
		for _, st := range c.Statements {
			if st.Theme > 1<<16 || st.Into > 1<<16 {
				return
			}
			k = max(k, st.Theme+1, st.Into+1)
		}
		if _, err := c.Map(k); err != nil {
			t.Fatalf("Map(%d): %v", k, err)
		}
	})
}

// TestMergeCopies: merged themes add their published repeated-text counts; a withheld
// count ("<10") withholds the sum, since adding it would reveal or guess at it. Expected
// values worked by hand.
func TestMergeCopies(t *testing.T) {
	tests := []struct {
		dst, src, want string
		withheld       bool
	}{
		{"24", "15", "39", true}, // share withheld until the count is recomputed
		{"<10", "15", "withheld", true},
		{"24", "<10", "withheld", true},
		{"", "", "", false},
		{"12", "", "withheld", true}, // one side searched, the other not: no honest sum
	}
	for _, tt := range tests {
		d, s := &Theme{Copies: tt.dst}, &Theme{Copies: tt.src}
		mergeCopies(d, s)
		if d.Copies != tt.want || d.CopiesWithheld != tt.withheld {
			t.Errorf("merge %q + %q = %q (withheld %v), want %q (%v)", tt.dst, tt.src, d.Copies, d.CopiesWithheld, tt.want, tt.withheld)
		}
	}
}
