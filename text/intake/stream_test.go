package intake

import (
	"bytes"
	"compress/gzip"
	"context"
	"errors"
	"fmt"
	"io"
	"math/rand/v2"
	"os"
	"path/filepath"
	"reflect"
	"sort"
	"strings"
	"testing"

	"undercurrent/text/demotown"

	"github.com/xuri/excelize/v2"
)

// streamAgrees reads paths with Read, Stream and Reader and checks that the three agree:
// the same records (in the same order; under KeepLast as a set, see Stream), rejects,
// notes, files and column names; and K + J = R.
func streamAgrees(t *testing.T, paths []string, stdin func() io.Reader, opt Options) *Set {
	t.Helper()
	if opt.Now.IsZero() {
		opt.Now = testNow
	}
	in := func() io.Reader {
		if stdin == nil {
			return nil
		}
		return stdin()
	}
	want, werr := Read(context.Background(), paths, in(), opt)
	var recs []Record
	got, gerr := Stream(context.Background(), paths, in(), opt, func(r Record) error {
		recs = append(recs, r)
		return nil
	})
	if (werr != nil) != (gerr != nil) || (werr != nil && werr.Error() != gerr.Error()) {
		t.Fatalf("Read error %v, Stream error %v", werr, gerr)
	}
	if werr != nil {
		return nil
	}
	if got.Kept() != len(recs) || got.Kept()+len(got.Rejects) != got.Read || len(got.Records) != 0 {
		t.Fatalf("Stream accounting: kept %d (%d records passed, %d held) + rejected %d, read %d", got.Kept(), len(recs), len(got.Records), len(got.Rejects), got.Read)
	}
	if opt.KeepLast {
		byPlace := func(r []Record) {
			sort.Slice(r, func(i, j int) bool {
				if r[i].File != r[j].File {
					return r[i].File < r[j].File
				}
				return r[i].Line < r[j].Line
			})
		}
		byPlace(recs)
		w := append([]Record(nil), want.Records...)
		byPlace(w)
		if !reflect.DeepEqual(recs, w) {
			t.Errorf("KeepLast: Stream's records differ from Read's")
		}
	} else {
		for i := range min(len(recs), len(want.Records)) {
			if !reflect.DeepEqual(recs[i], want.Records[i]) {
				t.Fatalf("record %d:\nStream %+v\nRead   %+v", i, recs[i], want.Records[i])
			}
		}
		if len(recs) != len(want.Records) {
			t.Fatalf("Stream %d records, Read %d", len(recs), len(want.Records))
		}
	}
	if !reflect.DeepEqual(got.Rejects, want.Rejects) {
		t.Errorf("rejects differ:\nStream %v\nRead   %v", got.Rejects, want.Rejects)
	}
	if !reflect.DeepEqual(got.Notes, want.Notes) {
		t.Errorf("notes differ:\nStream %q\nRead   %q", got.Notes, want.Notes)
	}
	if got.Summary() != want.Summary() {
		t.Errorf("summary: Stream %q, Read %q", got.Summary(), want.Summary())
	}
	g, w := *got, *want
	g.Records, w.Records, g.Rejects, w.Rejects, g.Notes, w.Notes, g.kept = nil, nil, nil, nil, nil, nil, 0
	if !reflect.DeepEqual(g, w) {
		t.Errorf("sets differ:\nStream %+v\nRead   %+v", g, w)
	}
	// The pull-style Reader passes the same records.
	r, err := NewReader(context.Background(), paths, in(), opt)
	if err != nil {
		t.Fatal(err)
	}
	defer r.Close()
	n := 0
	for {
		rec, err := r.Next()
		if err == io.EOF {
			break
		}
		if err != nil {
			t.Fatal(err)
		}
		if !opt.KeepLast && !reflect.DeepEqual(rec, want.Records[n]) {
			t.Fatalf("Reader record %d differs", n)
		}
		n++
	}
	if n != len(want.Records) || r.Set().Summary() != want.Summary() {
		t.Errorf("Reader: %d records, %s; Read %s", n, r.Set().Summary(), want.Summary())
	}
	return got
}

// bigCSV is a generated export of n rows that needs the whole file for its decisions:
// numeric dates decide day-first only after row n/2 (a value 25/3), every 97th row
// repeats an earlier id (every other one with other text), some ids are empty, some
// dates bad or implausible, some narratives placeholders, and some rows ragged.
func bigCSV(n int, seed uint64) []byte {
	rng := rand.New(rand.NewPCG(seed, 1))
	var b bytes.Buffer
	b.WriteString("Report No,Occurred Date,district,narrative\n")
	for i := 0; i < n; i++ {
		id := fmt.Sprintf("R%06d", i)
		day, month := 1+rng.IntN(12), 1+rng.IntN(12)
		if i > n/2 && rng.IntN(50) == 0 {
			day = 13 + rng.IntN(15)
		}
		date := fmt.Sprintf("%d/%d/20%02d", day, month, 10+rng.IntN(10))
		text := fmt.Sprintf("\"Unit %d responded to a call on Elm Street, row %d.\"", rng.IntN(40), i)
		switch {
		case i%97 == 5 && i > 100:
			id = fmt.Sprintf("R%06d", i-50)
			if i%2 == 0 {
				text = fmt.Sprintf("\"Unit %d responded to a call on Elm Street, row %d.\"", 0, i-50)
			}
		case i%211 == 7:
			id = ""
		case i%307 == 3:
			date = "not a date"
		case i%401 == 9:
			date = "1/1/1850"
		case i%503 == 11:
			text = "N/A"
		case i%601 == 13:
			fmt.Fprintf(&b, "%s,%s,north\n", id, date)
			continue
		}
		fmt.Fprintf(&b, "%s,%s,%s,%s\n", id, date, []string{"north", "south", "east"}[rng.IntN(3)], text)
	}
	return b.Bytes()
}

func gz(b []byte) []byte {
	var out bytes.Buffer
	w := gzip.NewWriter(&out)
	w.Write(b)
	w.Close()
	return out.Bytes()
}

// TestStreamAgreesWithRead: Stream and Reader give Read's records, rejects and notes
// on the package's test files and on generated ones (the oracle is Read itself, whose
// own tests check it against RFC 4180 and Python's csv module).
func TestStreamAgreesWithRead(t *testing.T) {
	dir := t.TempDir()
	write := func(name string, b []byte) string {
		p := filepath.Join(dir, name)
		if err := os.WriteFile(p, b, 0o644); err != nil {
			t.Fatal(err)
		}
		return p
	}
	big := bigCSV(12000, 1)
	bigPath := write("big.csv", big)
	// The same columns in another order, for a two-file run.
	var other bytes.Buffer
	other.WriteString("narrative,district,Occurred Date,Report No\n")
	other.WriteString("\"A later narrative.\",west,14/2/2021,X1\n\"Another.\",west,3/4/2021,R000010\n")
	otherPath := write("other.csv", other.Bytes())
	// JSON Lines where the time key that Options.Time names exactly comes late: the
	// first rows match it only ignoring case (the tally must be taken again).
	jsonl := "{\"id\":\"a\",\"date\":\"2020-01-05\",\"TIME\":\"1200\",\"text\":\"first one\"}\n" +
		"{\"id\":\"b\",\"date\":\"2020-01-06\",\"text\":\"second one\"}\n" +
		"{\"id\":\"c\",\"date\":\"2020-01-07\",\"time\":\"0930\",\"text\":\"third one\"}\n"
	jsonPath := write("late.jsonl", []byte(jsonl))
	txtDir := filepath.Join(dir, "txt")
	os.Mkdir(txtDir, 0o755)
	os.WriteFile(filepath.Join(txtDir, "a.txt"), []byte("Date: 2020-02-01\nOne narrative.\n"), 0o644)
	os.WriteFile(filepath.Join(txtDir, "b.txt"), []byte("caf\xe9 narrative"), 0o644)
	os.WriteFile(filepath.Join(txtDir, "c.txt"), nil, 0o644)
	book := excelize.NewFile()
	book.SetSheetRow("Sheet1", "A1", &[]any{"id", "date", "narrative"})
	book.SetSheetRow("Sheet1", "A2", &[]any{1, 43835.5, "first"})
	book.SetSheetRow("Sheet1", "A3", &[]any{2, "2020-01-06", "second", "extra"})
	book.SetSheetRow("Sheet1", "A4", &[]any{1, 43836, "again"})
	var xb bytes.Buffer
	book.WriteTo(&xb)
	xlsxPath := write("book.xlsx", xb.Bytes())
	demo := filepath.Join(dir, "demotown")
	if err := demotown.StreamDir(demo, demotown.Config{Seed: 3, N: 6000}); err != nil {
		t.Fatal(err)
	}
	cases := []struct {
		name  string
		paths []string
		stdin []byte
		opt   Options
	}{
		{"tricky", []string{"testdata/tricky.csv"}, nil, Options{}},
		{"demotown 6000", []string{filepath.Join(demo, demotown.IncidentsFile)}, nil, Options{}},
		{"big", []string{bigPath}, nil, Options{}},
		{"big keep last", []string{bigPath}, nil, Options{KeepLast: true}},
		{"big require date", []string{bigPath}, nil, Options{RequireDate: true, Groups: []string{"district"}}},
		{"big no id", []string{bigPath}, nil, Options{ID: "-"}},
		{"two files", []string{bigPath, otherPath}, nil, Options{}},
		{"two files keep last", []string{otherPath, bigPath}, nil, Options{KeepLast: true}},
		{"gzip", []string{write("big.csv.gz", gz(big))}, nil, Options{}},
		{"stdin", []string{"-"}, big[:bytes.LastIndexByte(big[:20000], '\n')+1], Options{}},
		{"jsonl late time key", []string{jsonPath}, nil, Options{Time: "time"}},
		{"txt folder", []string{txtDir}, nil, Options{}},
		{"xlsx", []string{xlsxPath}, nil, Options{}},
		{"missing column", []string{bigPath}, nil, Options{Text: []string{"narative"}}},
		{"different columns", []string{bigPath, jsonPath}, nil, Options{}},
	}
	for _, c := range cases {
		t.Run(c.name, func(t *testing.T) {
			var stdin func() io.Reader
			if c.stdin != nil {
				stdin = func() io.Reader { return bytes.NewReader(c.stdin) }
			}
			s := streamAgrees(t, c.paths, stdin, c.opt)
			if s != nil {
				t.Logf("%s", s.Summary())
			}
		})
	}
}

// An error from each stops Stream and comes back as it is; a closed Reader says so.
func TestStreamStops(t *testing.T) {
	p := writeFile(t, "big.csv", bigCSV(3000, 2))
	stop := errors.New("enough")
	n := 0
	_, err := Stream(context.Background(), []string{p}, nil, Options{Now: testNow}, func(Record) error {
		n++
		if n == 10 {
			return stop
		}
		return nil
	})
	if err != stop || n != 10 {
		t.Errorf("Stream: %d records, error %v", n, err)
	}
	r, err := NewReader(context.Background(), []string{p}, nil, Options{Now: testNow})
	if err != nil {
		t.Fatal(err)
	}
	if _, err := r.Next(); err != nil {
		t.Fatal(err)
	}
	r.Close()
	if _, err := r.Next(); err == nil || err == io.EOF {
		t.Errorf("Next after Close: %v", err)
	}
	ctx, cancel := context.WithCancel(context.Background())
	cancel()
	if _, err := Stream(ctx, []string{p}, nil, Options{Now: testNow}, func(Record) error { return nil }); !errors.Is(err, context.Canceled) {
		t.Errorf("cancelled Stream: %v", err)
	}
}

// FuzzStream: on any CSV or JSON bytes Stream agrees with Read.
func FuzzStream(f *testing.F) {
	for _, s := range []string{
		"id,date,text\n1,2020-01-05,hello\n1,2020-01-06,hello again\n,2020-01-07,no id\n",
		"date,text\n13/1/2020,a\n1/13/2020,b\n45000,c\n",
		"id,text\nf.csv:2,a\n,b\n",
		"{\"id\":1,\"text\":\"a\"}\n{\"id\":1,\"text\":\"b\",\"when\":\"2020-01-05\"}\n",
		"[{\"a\":\"x\"},{\"b\":\"y\"}]",
		"title\n\nid;text\n1;\"a\"\"b\"\n2;x\"y\n",
	} {
		f.Add([]byte(s), false)
		f.Add([]byte(s), true)
	}
	f.Fuzz(func(t *testing.T, data []byte, keepLast bool) {
		p := filepath.Join(t.TempDir(), "f.csv")
		if len(data) > 0 && (data[0] == '{' || data[0] == '[') {
			p = strings.TrimSuffix(p, ".csv") + ".json"
		}
		if err := os.WriteFile(p, data, 0o644); err != nil {
			t.Fatal(err)
		}
		streamAgrees(t, []string{p}, nil, Options{KeepLast: keepLast})
	})
}
