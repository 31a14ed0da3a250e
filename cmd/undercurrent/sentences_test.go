package main

import (
	"os"
	"path/filepath"
	"strings"
	"testing"

	"undercurrent/text/demotown"
)

// TestSetAsideRepeatedSentences: with -set-aside-repeated-sentences the report writes
// boilerplate-sentences.csv (keys only, counts of narratives) and the appendix note, and the
// model file carries the keys, so that tag sets the same sentences aside in a new narrative.
// The demo town's closing sentences ("Unit cleared.", demotown/lexicon.go) are planted in
// many narratives, so they must be among the keys.
func TestSetAsideRepeatedSentences(t *testing.T) {
	dir := t.TempDir()
	if err := demotown.Generate(demotown.Config{Seed: 5, N: 600}).WriteDir(dir); err != nil {
		t.Fatal(err)
	}
	out := filepath.Join(dir, "out")
	args := append([]string{"report", "-themes", "4", "-iterations", "40", "-chains", "1", "-set-aside-repeated-sentences", "-out", out}, inputArgs...)
	code, _, errs := runArgs(t, append(args, filepath.Join(dir, demotown.IncidentsFile))...)
	if code != exitOK {
		t.Fatalf("report: exit %d: %s", code, errs)
	}
	if !strings.Contains(errs, "boilerplate sentences:") {
		t.Errorf("stderr lacks the sentence summary: %s", errs)
	}
	b, err := os.ReadFile(filepath.Join(out, "boilerplate-sentences.csv"))
	if err != nil {
		t.Fatal(err)
	}
	recs := readCSV(t, string(b))
	if strings.Join(recs[0], ",") != "sentence,narratives,words" || len(recs) < 2 {
		t.Fatalf("boilerplate-sentences.csv: %v", recs)
	}
	found := false
	for _, r := range recs[1:] {
		found = found || r[0] == "unit cleared"
	}
	if !found {
		t.Errorf("\"unit cleared\" not among %v", recs)
	}
	m, fr, err := loadModel(filepath.Join(out, "themes.ucmodel"))
	if err != nil {
		t.Fatal(err)
	}
	_ = m
	if len(fr.Sentences) != len(recs)-1 || !fr.Settings.Sentences.Enabled {
		t.Fatalf("model carries %d keys, export lists %d", len(fr.Sentences), len(recs)-1)
	}
	if d := fr.Transform("Loud music at the park. UNIT CLEARED."); d.SetAside != 1 {
		t.Errorf("tag: %d sentences set aside, want 1", d.SetAside)
	}
	html, err := os.ReadFile(filepath.Join(out, "report.html"))
	if err != nil {
		t.Fatal(err)
	}
	if !strings.Contains(string(html), "boilerplate-sentences.csv") {
		t.Error("report appendix does not mention boilerplate-sentences.csv")
	}
}
