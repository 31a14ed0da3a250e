package text

import (
	"encoding/csv"
	"os"
	"path/filepath"
	"testing"
)

// sharedPath finds a file of the project's shared folder (corpora, refdata): it is beside the
// repository in CI and two levels up from a worktree; UNDERCURRENT_SHARED overrides. It
// returns "" when none exists.
func sharedPath(rel string) string {
	var dirs []string
	if d := os.Getenv("UNDERCURRENT_SHARED"); d != "" {
		dirs = append(dirs, d)
	}
	dirs = append(dirs, "../../shared", "../../../shared", "/work/shared")
	for _, d := range dirs {
		p := filepath.Join(d, rel)
		if _, err := os.Stat(p); err == nil {
			return p
		}
	}
	return ""
}

var oshaPath = sharedPath("corpora/osha-abstracts/osha.csv")

// loadOSHA reads the "Abstract Text" column of the OSHA accident abstracts (US federal
// government data, public domain; see /work/shared/corpora/SOURCES.md). It skips the test
// or benchmark when the file is absent.
func loadOSHA(tb testing.TB, max int) []string {
	tb.Helper()
	if oshaPath == "" {
		tb.Skip("OSHA corpus not found (set UNDERCURRENT_SHARED)")
	}
	f, err := os.Open(oshaPath)
	if err != nil {
		tb.Skipf("OSHA corpus not available: %v", err)
	}
	defer f.Close()
	r := csv.NewReader(f)
	head, err := r.Read()
	if err != nil {
		tb.Fatal(err)
	}
	col := -1
	for i, h := range head {
		if h == "Abstract Text" {
			col = i
		}
	}
	if col < 0 {
		tb.Fatalf("%s: no \"Abstract Text\" column", oshaPath)
	}
	var docs []string
	for max <= 0 || len(docs) < max {
		rec, err := r.Read()
		if err != nil {
			break
		}
		docs = append(docs, rec[col])
	}
	return docs
}
