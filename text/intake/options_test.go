package intake

import (
	"context"
	"errors"
	"strings"
	"testing"
)

func TestNoIDNoDateOptions(t *testing.T) {
	in := "case id,date,narrative\n7,2020-01-05,a\n7,2020-01-06,b\n"
	s, err := readOne(t, "o.csv", in, Options{ID: "-", Date: "-"})
	if err != nil {
		t.Fatal(err)
	}
	if s.IDName != "" || s.DateName != "" || len(s.Records) != 2 || s.Records[1].HasDate ||
		!strings.HasSuffix(s.Records[1].ID, "o.csv:3") || len(s.ExtraNames) != 2 {
		t.Errorf("%+v", s)
	}
}

func TestDelimiterOption(t *testing.T) {
	// Forced ';' on a file whose sniffed delimiter would be ','.
	s, err := readOne(t, "d.csv", "id;narrative\n1;a, b, c\n2;d, e\n", Options{Delimiter: ';'})
	if err != nil || s.Records[0].Text != "a, b, c" {
		t.Errorf("%v %+v", err, s)
	}
}

func TestCancelled(t *testing.T) {
	ctx, cancel := context.WithCancel(context.Background())
	cancel()
	p := writeFile(t, "c.csv", []byte("id,narrative\n1,a\n"))
	if _, err := Read(ctx, []string{p}, nil, Options{Now: testNow}); !errors.Is(err, context.Canceled) {
		t.Errorf("err %v", err)
	}
}

func TestStdinJSONAndMissingFile(t *testing.T) {
	s, err := Read(context.Background(), []string{"-"}, strings.NewReader(`[{"id":"x","narrative":"from a pipe"}]`), Options{Now: testNow})
	if err != nil || s.Files[0].Format != "json" || s.Records[0].Text != "from a pipe" {
		t.Errorf("%v %+v", err, s)
	}
	if _, err := Read(context.Background(), []string{"/nonexistent/x.csv"}, nil, Options{}); err == nil || !strings.Contains(err.Error(), "/nonexistent/x.csv") {
		t.Errorf("missing file: %v", err)
	}
	p := writeFile(t, "twice.csv", []byte("id,narrative\n1,a\n"))
	if _, err := Read(context.Background(), []string{p, p}, nil, Options{}); err == nil || !strings.Contains(err.Error(), "twice") {
		t.Errorf("same file twice: %v", err)
	}
	if _, err := Read(context.Background(), nil, nil, Options{}); err == nil {
		t.Error("no paths accepted")
	}
}

func TestLevenshtein(t *testing.T) {
	// Classic textbook pairs: kitten/sitting 3, flaw/lawn 2 (common practice examples).
	for _, tt := range []struct {
		a, b string
		d    int
	}{{"kitten", "sitting", 3}, {"flaw", "lawn", 2}, {"", "abc", 3}, {"same", "same", 0}, {"narrative", "narative", 1}} {
		if got := levenshtein(tt.a, tt.b); got != tt.d {
			t.Errorf("levenshtein(%q, %q) = %d, want %d", tt.a, tt.b, got, tt.d)
		}
	}
}

func TestHeaderHints(t *testing.T) {
	for _, tt := range []struct {
		h    string
		id   float64
		text bool
		date float64
	}{
		{"ID", 3, false, 0},
		{"summary_nr", 2, false, 0},
		{"caseNumber", 2, false, 0},
		{"Report #", 2, false, 0},
		{"Abstract Text", 0, true, 0},
		{"Officer Remarks", 0, true, 0},
		{"Event Start Date", 0, false, 2},
		{"SAFENET Create Date", 0, false, 0.5},
		{"Date", 0, false, 1},
		{"DOB", 0, false, 0.5},
	} {
		if a, b, c := hintID(tt.h), hintText(tt.h), hintDate(tt.h); a != tt.id || b != tt.text || c != tt.date {
			t.Errorf("%q: id %g text %v date %g; want %g %v %g", tt.h, a, b, c, tt.id, tt.text, tt.date)
		}
	}
}

func TestTimeColumn(t *testing.T) {
	in := "id,date,time,narrative\n1,01/05/2020,1545,a\n2,01/06/2020,3:10 AM,b\n3,01/07/2020,,c\n"
	s, err := readOne(t, "t.csv", in, Options{Time: "time"})
	if err != nil {
		t.Fatal(err)
	}
	var got []string
	for _, r := range s.Records {
		got = append(got, r.Date.Format("2006-01-02 15:04"))
	}
	if strings.Join(got, ",") != "2020-01-05 15:45,2020-01-06 03:10,2020-01-07 00:00" || s.TimeName != "time" || len(s.ExtraNames) != 0 {
		t.Errorf("%q %q %q", got, s.TimeName, s.ExtraNames)
	}
}
