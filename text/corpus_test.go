package text

import (
	"encoding/csv"
	"os"
	"testing"
)

const oshaPath = "/work/shared/corpora/osha-abstracts/osha.csv"

// loadOSHA reads the "Abstract Text" column of the OSHA accident abstracts (US federal
// government data, public domain; see /work/shared/corpora/SOURCES.md). It skips the test
// or benchmark when the file is absent.
func loadOSHA(tb testing.TB, max int) []string {
	tb.Helper()
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
