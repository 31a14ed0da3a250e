package intake

import (
	"context"
	"os"
	"path/filepath"
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

// corpusNow is a fixed present for the corpus runs (after their last dates).
var corpusNow = time.Date(2026, 1, 1, 0, 0, 0, 0, time.UTC)

func TestCorpusOSHA(t *testing.T) {
	p := filepath.Join(sharedDir(t), "corpora", "osha-abstracts", "osha.csv")
	s, err := Read(context.Background(), []string{p}, nil, Options{Now: corpusNow})
	if err != nil {
		t.Fatal(err)
	}
	t.Log(s.Summary())
	for _, n := range s.Notes {
		t.Log(n)
	}
	// 4,847 rows: /work/shared/corpora/SOURCES.md.
	if s.Read != 4847 || len(s.Records)+len(s.Rejects) != s.Read {
		t.Fatalf("read %d, kept %d, rejected %d; want 4847 accounted", s.Read, len(s.Records), len(s.Rejects))
	}
	if s.DateName != "Event Date" {
		t.Errorf("date column %q, want \"Event Date\" (SOURCES.md)", s.DateName)
	}
	t.Log(s.IDName, s.TextNames, s.DateRead)
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
	t.Log(s.Summary())
	for _, n := range s.Notes {
		t.Log(n)
	}
	if s.Read != 2394 || len(s.Records)+len(s.Rejects) != s.Read {
		t.Fatalf("read %d, kept %d, rejected %d; want 2394 accounted", s.Read, len(s.Records), len(s.Rejects))
	}
	t.Log(s.IDName, s.TextNames, s.DateName, s.DateRead)
}
