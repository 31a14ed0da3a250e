package intake

import (
	"bytes"
	"context"
	"encoding/json"
	"os"
	"path/filepath"
	"reflect"
	"strings"
	"testing"
	"time"
)

func TestQuartiles(t *testing.T) {
	// Hyndman and Fan (1996) definition 7 worked by hand: x = 1..10, h = 9p, so
	// Q1 = x[2] + 0.25(x[3]-x[2]) = 3.25, median 5.5, Q3 = 7.75 (numpy.percentile
	// gives the same, its default 'linear' method).
	x := []float64{10, 9, 8, 7, 6, 5, 4, 3, 2, 1}
	if got, want := quartiles(x), (Quartiles{1, 3.25, 5.5, 7.75, 10}); got != want {
		t.Errorf("quartiles = %+v, want %+v", got, want)
	}
	if got := quartiles([]float64{4}); got != (Quartiles{4, 4, 4, 4, 4}) {
		t.Errorf("one value: %+v", got)
	}
}

func TestSurveySmall(t *testing.T) {
	d := func(y int, m time.Month) time.Time { return time.Date(y, m, 3, 0, 0, 0, 0, time.UTC) }
	s := &Set{Read: 5, Records: []Record{
		{ID: "1", Text: "Checked the area, all clear.", Date: d(2020, 1), HasDate: true},
		{ID: "2", Text: "Checked the area, all clear.", Date: d(2020, 3), HasDate: true},
		{ID: "3", Text: "RP reported a loud party; checked the area.", Date: d(2020, 3), HasDate: true},
		{ID: "4", Text: "Loud music at 2 a.m.", HasDate: false},
	}, Rejects: []Reject{{Reason: ReasonEmptyNarrative}}}
	r := Survey(s, SurveyOptions{})
	wantMonths := []MonthCount{{"2020-01", 1, false}, {"2020-02", 0, true}, {"2020-03", 2, false}}
	if !reflect.DeepEqual(r.Months, wantMonths) || r.Dated != 3 {
		t.Errorf("months %+v", r.Months)
	}
	if r.DuplicateTexts != 1 || r.DuplicateShare != 0.25 {
		t.Errorf("duplicates %d %g", r.DuplicateTexts, r.DuplicateShare)
	}
	if want := []TermCount{{"checked", 2}, {"loud", 1}, {"rp", 1}}; !reflect.DeepEqual(r.Openings, want) {
		t.Errorf("openings %+v", r.Openings)
	}
	if want := []TermCount{{"checked the", 2}, {"loud music", 1}, {"rp reported", 1}}; !reflect.DeepEqual(r.OpeningBigrams, want) {
		t.Errorf("bigrams %+v", r.OpeningBigrams)
	}
	// "checked", "the", "area" are in 3 of 4 narratives (> 50%); "all", "clear" in 2 (= 50%, not more).
	if want := []WordShare{{"area", 3, 0.75}, {"checked", 3, 0.75}, {"the", 3, 0.75}}; !reflect.DeepEqual(r.CommonWords, want) {
		t.Errorf("common %+v", r.CommonWords)
	}
	// Words: 5, 5, 8, 5 (strings.Fields); characters 28, 28, 43, 20.
	if r.Words != (Quartiles{5, 5, 5, 5.75, 8}) || r.Chars.Min != 20 || r.Chars.Max != 43 {
		t.Errorf("lengths %+v %+v", r.Words, r.Chars)
	}
	var b bytes.Buffer
	if err := r.WriteText(&b); err != nil || !strings.Contains(b.String(), "2020-02      0  (empty)") {
		t.Errorf("WriteText:\n%s", b.String())
	}
}

// TestSurveyOSHA compares Survey on the osha corpus with figures computed by
// testdata/gen_survey_osha.py (Python csv module and NumPy), kept in
// testdata/survey_osha.json.
func TestSurveyOSHA(t *testing.T) {
	var want struct {
		Kept       int
		Chars      []float64
		Words      []float64
		Months     [][2]any
		Duplicates int
		Openings   [][2]any
		Bigrams    [][2]any
		Common     [][2]any
	}
	b, err := os.ReadFile(filepath.Join("testdata", "survey_osha.json"))
	if err != nil {
		t.Fatal(err)
	}
	if err := json.Unmarshal(b, &want); err != nil {
		t.Fatal(err)
	}
	p := filepath.Join(sharedDir(t), "corpora", "osha-abstracts", "osha.csv")
	s, err := Read(context.Background(), []string{p}, nil, Options{Now: corpusNow})
	if err != nil {
		t.Fatal(err)
	}
	r := Survey(s, SurveyOptions{})
	q := func(x Quartiles) []float64 { return []float64{x.Min, x.Q1, x.Median, x.Q3, x.Max} }
	if r.Kept != want.Kept || !reflect.DeepEqual(q(r.Chars), want.Chars) || !reflect.DeepEqual(q(r.Words), want.Words) || r.DuplicateTexts != want.Duplicates {
		t.Errorf("kept %d chars %v words %v dups %d; want %d %v %v %d", r.Kept, q(r.Chars), q(r.Words), r.DuplicateTexts, want.Kept, want.Chars, want.Words, want.Duplicates)
	}
	pairs := func(p [][2]any) []TermCount {
		var out []TermCount
		for _, x := range p {
			out = append(out, TermCount{x[0].(string), int(x[1].(float64))})
		}
		return out
	}
	var months []TermCount
	for _, m := range r.Months {
		if !m.Empty {
			months = append(months, TermCount{m.Month, m.N})
		}
	}
	if !reflect.DeepEqual(months, pairs(want.Months)) {
		t.Errorf("months %v, want %v", months, pairs(want.Months))
	}
	if !reflect.DeepEqual(r.Openings, pairs(want.Openings)) || !reflect.DeepEqual(r.OpeningBigrams, pairs(want.Bigrams)) {
		t.Errorf("openings %v %v, want %v %v", r.Openings, r.OpeningBigrams, pairs(want.Openings), pairs(want.Bigrams))
	}
	var common []TermCount
	for _, w := range r.CommonWords {
		common = append(common, TermCount{w.Word, w.Docs})
	}
	if !reflect.DeepEqual(common, pairs(want.Common)) {
		t.Errorf("common %v, want %v", common, pairs(want.Common))
	}
}

func TestSurveyGroups(t *testing.T) {
	in := "id,District,Beat,Unit,narrative\n" +
		"1,North,7,u1,noise complaint\n2,North,8,u2,alarm call\n3,South,7,u3,loose dog\n4,,9,u4,parking\n5,East,7,,lost wallet\n"
	s, err := readOne(t, "g.csv", in, Options{Groups: []string{"District"}})
	if err != nil {
		t.Fatal(err)
	}
	r := Survey(s, SurveyOptions{Top: 2})
	want := []ColumnValues{{"District", 3, 1, []TermCount{{"North", 2}, {"East", 1}}}}
	if !reflect.DeepEqual(r.Groups, want) {
		t.Errorf("groups %+v", r.Groups)
	}
	// Beat: 3 values, none empty -> candidate; Unit: 4 values but 1 of 5 empty
	// (more than a tenth) -> not; id and narrative are not passed through.
	if len(r.GroupCandidates) != 1 || r.GroupCandidates[0].Name != "Beat" || r.GroupCandidates[0].Distinct != 3 {
		t.Errorf("candidates %+v", r.GroupCandidates)
	}
}
