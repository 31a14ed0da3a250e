package trend

import (
	"bytes"
	"encoding/csv"
	"encoding/json"
	"errors"
	"flag"
	"math/rand/v2"
	"os"
	"path/filepath"
	"strings"
	"testing"
	"time"
)

var update = flag.Bool("update", false, "rewrite testdata/golden_* files")

// demoDocs makes invented narratives for an invented town: 3 themes, 3 districts,
// 2022-01-05 .. 2023-06-20, no narratives in 2022-08, theme 2 rising, a burst of
// theme 1 in 2023-02.
func demoDocs() []Doc {
	rng := rand.New(rand.NewPCG(2026, 7))
	districts := []string{"Harbour", "Millbrook", "Old Town"}
	words := [][]string{{"door", "forced", "window"}, {"alarm", "noise", "party"}, {"car", "parked", "blocked"}}
	var docs []Doc
	for d := day("2022-01-05"); !d.After(day("2023-06-20")); d = d.AddDate(0, 0, 1) {
		if d.Year() == 2022 && d.Month() == time.August {
			continue
		}
		months := float64(int(MonthOf(d) - MonthFor(2022, time.January)))
		for n := rng.IntN(4); n > 0; n-- {
			g := rng.IntN(3)
			w := []float64{1 + float64(g)*0.3, 1, 0.3 + 0.06*months}
			if MonthOf(d) == MonthFor(2023, time.February) {
				w[1] += 2
			}
			k := pick(rng, w)
			theta := []float64{0.1, 0.1, 0.1}
			theta[k] = 0.8
			bag := map[string]int{}
			for j := 0; j < 5; j++ {
				bag[words[pick(rng, w)][rng.IntN(3)]]++
			}
			if g == 1 {
				bag["bridge"]++
			}
			docs = append(docs, Doc{Date: d, Theta: theta, Group: districts[g], Words: bag})
		}
	}
	return docs
}

func pick(rng *rand.Rand, w []float64) int {
	s := 0.0
	for _, v := range w {
		s += v
	}
	u := rng.Float64() * s
	for i, v := range w {
		if u < v {
			return i
		}
		u -= v
	}
	return len(w) - 1
}

func demoTables(t *testing.T, p Publish) []*Table {
	t.Helper()
	docs := demoDocs()
	s, err := Monthly(docs, Settings{})
	if err != nil {
		t.Fatal(err)
	}
	labels := []string{"entry", "noise", "parking"}
	cs := ChangeSettings{}
	flags := Changes(s, cs)
	g, err := Groups(docs, GroupSettings{})
	if err != nil {
		t.Fatal(err)
	}
	words, err := GroupWords(docs, "Millbrook", nil, WordSettings{})
	if err != nil {
		t.Fatal(err)
	}
	return []*Table{SeriesTable(s, flags, labels, p), FlagTable(s, flags, cs, labels, p), TrendTable(s, labels, 0, p),
		g.Table(labels, p), GroupTestTable(g, GroupSettings{}, p), WordTable(words, "Millbrook", "rest", 5, p)}
}

func TestExportGolden(t *testing.T) {
	// Golden files: the published (suppressed) tables of the invented demo data; they
	// pin the column names, formatting and order. Regenerate with -update after a
	// deliberate change and review the diff.
	for _, tb := range demoTables(t, Publish{}) {
		var c, j bytes.Buffer
		if err := tb.WriteCSV(&c); err != nil {
			t.Fatal(err)
		}
		if err := tb.WriteJSON(&j); err != nil {
			t.Fatal(err)
		}
		var decoded struct {
			Table         string
			WithheldBelow int `json:"withheld_below"`
			Rows          []map[string]any
		}
		if err := json.Unmarshal(j.Bytes(), &decoded); err != nil {
			t.Fatalf("%s JSON: %v", tb.Name, err)
		}
		if decoded.Table != tb.Name || decoded.WithheldBelow != 10 || len(decoded.Rows) != len(tb.Rows) {
			t.Errorf("%s JSON header %q %d, %d rows", tb.Name, decoded.Table, decoded.WithheldBelow, len(decoded.Rows))
		}
		recs, err := csv.NewReader(bytes.NewReader(c.Bytes())).ReadAll()
		if err != nil || len(recs) != len(tb.Rows)+1 {
			t.Fatalf("%s CSV: %v, %d records", tb.Name, err, len(recs))
		}
		for _, ext := range []string{".csv", ".json"} {
			got := c.Bytes()
			if ext == ".json" {
				got = j.Bytes()
			}
			path := filepath.Join("testdata", "golden_"+tb.Name+ext)
			if *update {
				if err := os.WriteFile(path, got, 0o644); err != nil {
					t.Fatal(err)
				}
				continue
			}
			want, err := os.ReadFile(path)
			if err != nil {
				t.Fatal(err)
			}
			if !bytes.Equal(got, want) {
				t.Errorf("%s differs from %s (run go test -run TestExportGolden -update and review the diff)", tb.Name, path)
			}
		}
	}
}

func TestExportWithholds(t *testing.T) {
	tables := demoTables(t, Publish{})
	for _, tb := range tables {
		for c, col := range tb.Columns {
			if !map[string]bool{"count": true, "expected": true, "total": true, "group_total": true, "count_a": true, "count_b": true}[col.Name] {
				continue
			}
			for _, r := range tb.Rows {
				if v := r[c]; v != "" && v != "<10" && v != Hidden && !(v == "0" && tb.Name == "words") {
					if f, err := parseFloat(v); err != nil || f < 10 {
						t.Errorf("%s %s = %q published", tb.Name, col.Name, v)
					}
				}
			}
		}
	}
	// Something must actually be withheld in the demo, or the test above proves nothing.
	var series bytes.Buffer
	tables[0].WriteCSV(&series)
	if !strings.Contains(series.String(), "<10") {
		t.Error("nothing withheld in the demo series")
	}
	// Gap month 2022-08: empty numbers, gap=true.
	for _, r := range tables[0].Rows {
		if r[0] == "2022-08" && (r[3] != "" || r[5] != "" || r[11] != "true") {
			t.Errorf("gap row %v", r)
		}
		if r[0] == "2022-01" && r[10] != "true" {
			t.Errorf("first month not partial: %v", r)
		}
	}
}

func TestExportPrivate(t *testing.T) {
	dir := t.TempDir()
	all := demoTables(t, Publish{Everything: true})
	tb := all[0]
	if !tb.Private() || tb.Threshold != 0 {
		t.Fatal("Everything table not private")
	}
	if err := tb.WriteCSV(&bytes.Buffer{}); !errors.Is(err, ErrPrivate) {
		t.Errorf("WriteCSV of private table: %v", err)
	}
	if err := tb.WriteJSON(&bytes.Buffer{}); !errors.Is(err, ErrPrivate) {
		t.Errorf("WriteJSON of private table: %v", err)
	}
	public := filepath.Join(dir, "series.csv")
	if err := WriteFiles(public, tb); !errors.Is(err, ErrPrivate) {
		t.Errorf("WriteFiles(series.csv) of private table: %v", err)
	}
	if _, err := os.Stat(public); !os.IsNotExist(err) {
		t.Error("private table written to a public name")
	}
	// A directory named private does not count: the file name must say it.
	if err := os.Mkdir(filepath.Join(dir, "private"), 0o755); err != nil {
		t.Fatal(err)
	}
	if err := WriteFiles(filepath.Join(dir, "private", "series.csv"), tb); !errors.Is(err, ErrPrivate) {
		t.Errorf("private directory: %v", err)
	}
	priv := filepath.Join(dir, "series-PRIVATE.csv")
	if err := WriteFiles(priv, tb); err != nil {
		t.Fatal(err)
	}
	b, err := os.ReadFile(filepath.Join(dir, "series-PRIVATE.json"))
	if err != nil || strings.Contains(string(b), "<10") {
		t.Errorf("private JSON: %v, withheld values present: %v", err, strings.Contains(string(b), "<10"))
	}
	// Published tables go anywhere; both files are byte-identical across runs.
	pub := demoTables(t, Publish{})[0]
	if err := WriteFiles(public, pub); err != nil {
		t.Fatal(err)
	}
	first, _ := os.ReadFile(public)
	WriteFiles(public, demoTables(t, Publish{})[0])
	second, _ := os.ReadFile(public)
	if !bytes.Equal(first, second) {
		t.Error("two runs differ")
	}
	if err := WriteFiles(filepath.Join(dir, "x.json"), pub); err == nil {
		t.Error("CSV path ending in .json accepted")
	}
}

func TestExportFormulaGuard(t *testing.T) {
	docs := []Doc{}
	for i := 0; i < 12; i++ {
		docs = append(docs, Doc{Group: "=HYPERLINK(\"http://example.invalid\")", Theta: []float64{1, 0}},
			Doc{Group: "-2+3", Theta: []float64{0, 1}})
	}
	g, err := Groups(docs, GroupSettings{})
	if err != nil {
		t.Fatal(err)
	}
	var c, j bytes.Buffer
	tb := g.Table([]string{"@one", "two"}, Publish{})
	tb.WriteCSV(&c)
	tb.WriteJSON(&j)
	for _, want := range []string{"'-2+3,0,'@one,", `"'=HYPERLINK(""http://example.invalid"")",1,two,`} {
		if !strings.Contains(c.String(), want) {
			t.Errorf("CSV lacks %s:\n%s", want, c.String())
		}
	}
	// JSON keeps the values as they are.
	if !strings.Contains(j.String(), `"group": "-2+3"`) || !strings.Contains(j.String(), `"label": "@one"`) {
		t.Errorf("JSON altered values:\n%s", j.String())
	}
}
