package export

import (
	"bytes"
	"encoding/csv"
	"errors"
	"math"
	"path/filepath"
	"strings"
	"testing"

	"undercurrent/report"
	"undercurrent/report/trend"
)

// Expected files are written by hand from the column documentation. Quoting follows
// RFC 4180 (as encoding/csv writes it): fields with a comma, quote or line break are
// quoted and quotes doubled.
func TestWriteWide(t *testing.T) {
	rows := []WideRow{
		{ID: "LK-1", Date: "2024-03-01", Groups: []string{"Harbour"}, Theta: []float64{0.1, 0.6, 0.2, 0.1}},
		{ID: "=cmd|' /C calc'!A0", Date: "", Groups: []string{"Old Town, east"}, Theta: []float64{0.25, 0.25, 0.25, 0.25}},
		{ID: "LK-3", Date: "2024-03-02", Groups: []string{"-5"}, Theta: []float64{0, 0, 0, 1}},
	}
	var buf bytes.Buffer
	if err := WriteWide(&buf, []string{"district"}, []string{"parking", "noise \"loud\"", "@alarm", "theft"}, rows); err != nil {
		t.Fatal(err)
	}
	want := "id,date,district,theme,label,share,second_theme,second_share,third_theme,third_share\n" +
		"LK-1,2024-03-01,Harbour,1,\"noise \"\"loud\"\"\",0.6000,2,0.2000,0,0.1000\n" +
		"'=cmd|' /C calc'!A0,,\"Old Town, east\",0,parking,0.2500,1,0.2500,2,0.2500\n" +
		"LK-3,2024-03-02,'-5,3,theft,1.0000,,,,\n"
	if buf.String() != want {
		t.Errorf("got\n%s\nwant\n%s", buf.String(), want)
	}
	if _, err := csv.NewReader(&buf).ReadAll(); err != nil {
		t.Errorf("output does not read back: %v", err)
	}

	err := WriteWide(&buf, nil, []string{"a", "b"}, []WideRow{{ID: "x", Theta: []float64{math.NaN(), 1}}})
	var re *RowError
	if !errors.As(err, &re) || re.Row != 0 || re.ID != "x" {
		t.Errorf("NaN share: got %v", err)
	}
}

// TestTop3: expected orders worked by hand from the rule (highest share first, ties to the
// lower theme; themes without a share left out).
func TestTop3(t *testing.T) {
	for _, tc := range []struct {
		in   []float64
		want []int
	}{
		{nil, nil},
		{[]float64{0, 0, 0, 1}, []int{3}},        // routine: all its share in the last column
		{[]float64{0, 0.6, 0, 0.4}, []int{1, 3}}, // zero shares are not next themes
		{[]float64{0, 0}, []int{0}},              // no share anywhere: theme 0 alone
		{[]float64{0.5}, []int{0}},
		{[]float64{0.2, 0.8}, []int{1, 0}},
		{[]float64{0.1, 0.3, 0.2, 0.4}, []int{3, 1, 2}},
		{[]float64{0.3, 0.3, 0.3, 0.1}, []int{0, 1, 2}},
		{[]float64{0.1, 0.2, 0.2, 0.2, 0.3}, []int{4, 1, 2}},
	} {
		best, n := Top3(tc.in)
		got := best[:n]
		if len(got) != len(tc.want) {
			t.Errorf("top3(%v) = %v, want %v", tc.in, got, tc.want)
			continue
		}
		for i := range got {
			if got[i] != tc.want[i] {
				t.Errorf("top3(%v) = %v, want %v", tc.in, got, tc.want)
				break
			}
		}
	}
}

func TestWriteLong(t *testing.T) {
	rows := LongRows(nil, "LK-1", []float64{0.05, 0.7, 0.25}, 0.1)
	rows = LongRows(rows, "+LK-2", []float64{1, 0, 0}, 0.1)
	var buf bytes.Buffer
	if err := WriteLong(&buf, rows); err != nil {
		t.Fatal(err)
	}
	want := "id,theme,share\nLK-1,1,0.7000\nLK-1,2,0.2500\n'+LK-2,0,1.0000\n"
	if buf.String() != want {
		t.Errorf("got\n%s\nwant\n%s", buf.String(), want)
	}
	if err := WriteLong(&buf, []LongRow{{ID: "a", Theme: 0, Share: 1.5}}); err == nil {
		t.Error("share 1.5 accepted")
	}
}

func TestWriteThemes(t *testing.T) {
	d := report.Sample(report.SampleSettings{Seed: 1, Themes: 4})
	c, err := report.ParseLabels("l.txt", strings.NewReader("theme 0: label = Parking, mostly\nmerge 3 into 0\nhide 2\n"))
	if err != nil {
		t.Fatal(err)
	}
	if err := report.Apply(d, c, nil); err != nil {
		t.Fatal(err)
	}
	var buf bytes.Buffer
	if err := WriteThemes(&buf, ThemeRows(d)); err != nil {
		t.Fatal(err)
	}
	recs, err := csv.NewReader(&buf).ReadAll()
	if err != nil {
		t.Fatal(err)
	}
	if len(recs) != 5 || strings.Join(recs[0], ",") != "theme,label,label_by,top_words,narratives,expected,share,status,repeated_text" {
		t.Fatalf("got %q", recs)
	}
	status := map[string]string{}
	for _, r := range recs[1:] {
		status[r[0]] = r[7]
		if r[0] == "0" && (r[1] != "Parking, mostly" || r[2] != "person") {
			t.Errorf("theme 0 row %q", r)
		}
	}
	if status["0"] != "shown" || status["1"] != "shown" || status["2"] != "hidden" || status["3"] != "merged into 0" {
		t.Errorf("status = %v", status)
	}
}

func TestColumnsMarkdown(t *testing.T) {
	got := ColumnsMarkdown(LongColumns)
	want := "| column | meaning |\n|---|---|\n| `id` | narrative reference: file:line in the input by default, the record id with -publish-ids (tag writes record ids); exports hold no narrative text |\n| `theme` | theme number (0-based) |\n| `share` | the theme's share of the narrative, 0 to 1 |\n"
	if got != want {
		t.Errorf("got\n%s", got)
	}
}

// TestCopyTable: CSV and JSON written by hand from CopyColumns and trend.Table's formats
// (integers in decimal, other numbers with 6 decimals; a text cell starting with = gets an
// apostrophe in the CSV only); a private table goes only to a *private* file.
func TestCopyTable(t *testing.T) {
	rows := []CopyRow{
		{Group: 1, Size: 2, LeastSimilarity: 0.75, ID: "incidents.csv:12", Theme: 3, Label: "alarm · keyholder"},
		{Group: 1, Size: 2, LeastSimilarity: 0.75, ID: "incidents.csv:40", Theme: 0, Label: "=parking"},
	}
	for _, tc := range []struct {
		name, csv, json string
		p               trend.Publish
	}{
		{"published", "group,size,least_similarity,id,theme,label\n" +
			"1,2,0.750000,incidents.csv:12,3,alarm · keyholder\n" +
			"1,2,0.750000,incidents.csv:40,0,'=parking\n",
			`{"table": "repeated_text", "withheld_below": 10, "rows": [` + "\n" +
				` {"group": 1, "size": 2, "least_similarity": 0.750000, "id": "incidents.csv:12", "theme": 3, "label": "alarm · keyholder"},` + "\n" +
				` {"group": 1, "size": 2, "least_similarity": 0.750000, "id": "incidents.csv:40", "theme": 0, "label": "=parking"}` + "\n]}\n",
			trend.Publish{}},
		{"threshold 5", "group,size,least_similarity,id,theme,label\n" +
			"1,2,0.750000,incidents.csv:12,3,alarm · keyholder\n" +
			"1,2,0.750000,incidents.csv:40,0,'=parking\n",
			`{"table": "repeated_text", "withheld_below": 5, "rows": [` + "\n" +
				` {"group": 1, "size": 2, "least_similarity": 0.750000, "id": "incidents.csv:12", "theme": 3, "label": "alarm · keyholder"},` + "\n" +
				` {"group": 1, "size": 2, "least_similarity": 0.750000, "id": "incidents.csv:40", "theme": 0, "label": "=parking"}` + "\n]}\n",
			trend.Publish{Threshold: 5}},
	} {
		tab := CopyTable(rows, tc.p)
		var c, j bytes.Buffer
		if err := tab.WriteCSV(&c); err != nil {
			t.Fatal(err)
		}
		if err := tab.WriteJSON(&j); err != nil {
			t.Fatal(err)
		}
		if c.String() != tc.csv {
			t.Errorf("%s CSV:\n%s\nwant\n%s", tc.name, c.String(), tc.csv)
		}
		if j.String() != tc.json {
			t.Errorf("%s JSON:\n%s\nwant\n%s", tc.name, j.String(), tc.json)
		}
	}
	priv := CopyTable(rows, trend.Publish{Everything: true})
	dir := t.TempDir()
	if err := trend.WriteFiles(filepath.Join(dir, "repeated-text.csv"), priv); !errors.Is(err, trend.ErrPrivate) {
		t.Errorf("private table to a public name: %v, want ErrPrivate", err)
	}
	if err := trend.WriteFiles(filepath.Join(dir, "repeated-text.private.csv"), priv); err != nil {
		t.Errorf("private table to a private name: %v", err)
	}
	if len(CopyColumns) != len(CopyTable(nil, trend.Publish{}).Columns) {
		t.Error("CopyColumns does not document every column")
	}
}
