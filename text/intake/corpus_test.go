package intake

import (
	"context"
	"encoding/json"
	"os"
	"path/filepath"
	"reflect"
	"sort"
	"testing"
	"time"
)

// sharedDir finds the shared folder: $UNDERCURRENT_SHARED, else the nearest parent
// directory holding shared/corpora. It fails the test when there is none: these tests
// must not pass silently on a machine without the corpora.
func sharedDir(t *testing.T) string {
	t.Helper()
	if d := os.Getenv("UNDERCURRENT_SHARED"); d != "" {
		if st, err := os.Stat(filepath.Join(d, "corpora")); err == nil && st.IsDir() {
			return d
		}
		t.Fatalf("UNDERCURRENT_SHARED=%s has no corpora folder", d)
	}
	dir, err := filepath.Abs(".")
	if err != nil {
		t.Fatal(err)
	}
	for {
		c := filepath.Join(dir, "shared", "corpora")
		if st, err := os.Stat(c); err == nil && st.IsDir() {
			return filepath.Join(dir, "shared")
		}
		up := filepath.Dir(dir)
		if up == dir {
			t.Fatal("shared/corpora not found: set UNDERCURRENT_SHARED or put shared/ beside the repository")
		}
		dir = up
	}
}

// corpusCounts reads testdata/corpus_counts.json, written by
// testdata/gen_corpus_counts.py (Python's csv module, independent of this package).
func corpusCounts(t *testing.T, name string) (read, kept int, rejected map[string]int) {
	t.Helper()
	b, err := os.ReadFile(filepath.Join("testdata", "corpus_counts.json"))
	if err != nil {
		t.Fatal(err)
	}
	var all map[string]struct {
		Read, Kept int
		Rejected   map[string]int
	}
	if err := json.Unmarshal(b, &all); err != nil {
		t.Fatal(err)
	}
	c := all[name]
	return c.Read, c.Kept, c.Rejected
}

func checkCounts(t *testing.T, name string, s *Set) {
	t.Helper()
	read, kept, rej := corpusCounts(t, name)
	got := map[string]int{}
	for _, c := range RejectCounts(s.Rejects) {
		got[c.Reason] = c.N
	}
	if s.Read != read || len(s.Records) != kept || !reflect.DeepEqual(got, rej) {
		t.Errorf("%s: %s; want read %d, kept %d, rejected %v (testdata/corpus_counts.json)", name, s.Summary(), read, kept, rej)
	}
}

// corpusNow is a fixed present for the corpus runs (after their last dates).
var corpusNow = time.Date(2026, 1, 1, 0, 0, 0, 0, time.UTC)

func TestCorpusOSHA(t *testing.T) {
	p := filepath.Join(sharedDir(t), "corpora", "osha-abstracts", "osha.csv")
	s, err := Read(context.Background(), []string{p}, nil, Options{Now: corpusNow})
	if err != nil {
		t.Fatal(err)
	}
	// 4,847 rows: /work/shared/corpora/SOURCES.md.
	if s.Read != 4847 || len(s.Records)+len(s.Rejects) != s.Read {
		t.Fatalf("read %d, kept %d, rejected %d; want 4847 accounted", s.Read, len(s.Records), len(s.Rejects))
	}
	checkCounts(t, "osha", s)
	if s.DateName != "Event Date" || s.DateRead != "month-first" || s.TextNames[0] != "Abstract Text" || s.IDName != "summary_nr" {
		t.Errorf("columns id %q date %q (%s) text %q; want summary_nr, Event Date (M/D/YYYY, SOURCES.md), Abstract Text", s.IDName, s.DateName, s.DateRead, s.TextNames)
	}
	for _, r := range s.Records {
		if !r.HasDate {
			t.Fatalf("record %s:%d has no date", r.File, r.Line)
		}
	}
}

func TestCorpusSafenet(t *testing.T) {
	paths, err := filepath.Glob(filepath.Join(sharedDir(t), "corpora", "safenet", "SAFENET_*.csv"))
	if err != nil {
		t.Fatal(err)
	}
	sort.Strings(paths)
	if len(paths) != 23 {
		t.Fatalf("%d safenet files, want 23 (SOURCES.md)", len(paths))
	}
	s, err := Read(context.Background(), paths, nil, Options{Now: corpusNow})
	if err != nil {
		t.Fatal(err)
	}
	if s.Read != 2394 || len(s.Records)+len(s.Rejects) != s.Read {
		t.Fatalf("read %d, kept %d, rejected %d; want 2394 accounted", s.Read, len(s.Records), len(s.Rejects))
	}
	checkCounts(t, "safenet", s)
	// SOURCES.md: date column "Event Start Date"; fields separated by ", ".
	if s.IDName != "ID" || s.DateName != "Event Start Date" || s.TextNames[0] != "Narrative" || s.Files[5].Delimiter != ", " {
		t.Errorf("columns id %q date %q text %q, delimiter %q", s.IDName, s.DateName, s.TextNames, s.Files[5].Delimiter)
	}
}

func readPaths(paths []string) (*Set, error) {
	return Read(context.Background(), paths, nil, Options{Now: corpusNow})
}
