package text

import (
	"bytes"
	"context"
	"encoding/json"
	"path/filepath"
	"reflect"
	"strings"
	"testing"

	"undercurrent/text/intake"
	"undercurrent/text/redact"
)

// sentenceSettings are plainSettings with the sentence step on at the given threshold (the
// share rule made too small to matter).
func sentenceSettings(minNarratives int) Settings {
	s := plainSettings()
	s.Sentences = SentenceSettings{Enabled: true, MinNarratives: minNarratives, MinShare: 1e-9, MinTokens: 2, Repeats: true}
	return s
}

// handCorpus is a small invented corpus whose sentence counts are worked by hand below.
var handCorpus = []string{
	"Alarm at the bank. Checked the area, all clear. No further action.",
	"Window broken at 12 Elm Road. Checked the area, all clear. No further action.",
	"Checked the area, all clear. Owner notified. No further action. No further action.",
	"Dog loose on Main St. near the park. Employee #1 was transported to the hospital.",
	"Employee #2 was transported to the hospital. Checked the area.",
	"Employee #7 was transported to the hospital! Suspect fled on foot; suspect fled on foot. Yes.",
}

// TestSentencesHandCorpus: counts worked by hand on handCorpus with a threshold of 3
// narratives. Sentences (keys):
//
//	0: alarm at the bank | checked the area all clear | no further action
//	1: window broken at [number] elm road | checked the area all clear | no further action
//	2: checked the area all clear | owner notified | no further action | no further action
//	3: dog loose on main st near the park ("St." does not cut) | employee [number] was transported to the hospital
//	4: employee [number] was transported to the hospital | checked the area
//	5: employee [number] was transported to the hospital | suspect fled on foot | suspect fled on foot | yes
//
// "checked the area all clear" is in narratives 0-2 (3), "no further action" in 0-2 (3:
// narrative 2 counts once), "employee [number] was transported to the hospital" in 3-5 (3):
// boilerplate. "checked the area" is in one narrative, "yes" is one token. Set aside:
// narrative 0: 2 sentences, 1: 2, 2: 3 (its second "no further action" is boilerplate, not a
// repeat), 3: 1, 4: 1, 5: 2 (the second "suspect fled on foot" as a repeat). Sentences 11,
// repeats 1; tokens 5·3 + 3·4 + 7·3 + 4 = 52; narratives by sentences set aside: none with 0,
// two with 1 (3, 4), three with 2 (0, 1, 5), one with 3 (2).
func TestSentencesHandCorpus(t *testing.T) {
	c, f := build(t, handCorpus, sentenceSettings(3))
	want := &SentenceReport{
		Threshold: 3,
		Keys: []SentenceKey{
			{"checked the area all clear", 3, 5},
			{"employee [number] was transported to the hospital", 3, 7},
			{"no further action", 3, 3},
		},
		Sentences: 11, Repeats: 1, Tokens: 52,
		Narratives:       []int{0, 2, 3, 1},
		RepeatNarratives: 1,
	}
	if !reflect.DeepEqual(c.Sentences, want) {
		t.Errorf("report:\n got  %+v\n want %+v", c.Sentences, want)
	}
	if wantKeys := []string{"checked the area all clear", "employee [number] was transported to the hospital", "no further action"}; !reflect.DeepEqual(f.Sentences, wantKeys) {
		t.Errorf("frozen keys %q", f.Sentences)
	}
	// What is left of each narrative (plainSettings: no stopwords, no stemming; numbers
	// dropped), by hand from the sentences above.
	left := [][]string{
		{"alarm", "at", "the", "bank"},
		{"window", "broken", "at", "elm", "road"},
		{"owner", "notified"},
		{"dog", "loose", "on", "main", "st", "near", "the", "park"},
		{"checked", "the", "area"},
		{"suspect", "fled", "on", "foot", "yes"},
	}
	for i, d := range handCorpus {
		doc := f.Transform(d)
		var got []string
		for k, id := range doc.Terms {
			got = append(got, c.Vocab[id])
			// Offsets still index the original text.
			if sp := doc.Spans[k]; !strings.EqualFold(d[sp.Start:sp.End], c.Vocab[id]) {
				t.Errorf("narrative %d: span %q for term %q", i, d[sp.Start:sp.End], c.Vocab[id])
			}
		}
		if !reflect.DeepEqual(got, left[i]) {
			t.Errorf("narrative %d: terms %q, want %q", i, got, left[i])
		}
		cols, _ := c.Counts.Row(i)
		if len(cols) == 0 {
			t.Errorf("narrative %d: empty row", i)
		}
	}
}

// TestSentencesFrozenNewNarrative: a narrative the fit never saw loses the same sentences,
// through the keys the model carries, however it is batched (one narrative at a time, or a
// batch of narratives none of which repeats anything); the step off keeps everything.
func TestSentencesFrozenNewNarrative(t *testing.T) {
	_, f := build(t, handCorpus, sentenceSettings(3))
	vocab := func(d Doc) []string {
		var out []string
		for _, id := range d.Terms {
			out = append(out, f.Vocab[id])
		}
		return out
	}
	cases := []struct {
		in       string
		terms    []string
		setAside int
	}{
		// By hand: "checked the area all clear" and "no further action" are model keys.
		{"CHECKED THE AREA - ALL CLEAR.\nAlarm at the park.\nNo further action", []string{"alarm", "at", "the", "park"}, 2},
		// Employee #9: the number is keyed by kind.
		{"Employee #9 was transported to the hospital. Dog at the bank.", []string{"dog", "at", "the", "bank"}, 1},
		// A repeat within the new narrative (not a key of the model).
		{"Dog at the bank. Dog at the bank.", []string{"dog", "at", "the", "bank"}, 1},
		// Part of a key is not the key.
		{"Checked the area. Dog loose.", []string{"checked", "the", "area", "dog", "loose"}, 0},
	}
	for _, c := range cases {
		d := f.Transform(c.in)
		if got := vocab(d); !reflect.DeepEqual(got, c.terms) || d.SetAside != c.setAside {
			t.Errorf("%q: terms %q set aside %d, want %q %d", c.in, got, d.SetAside, c.terms, c.setAside)
		}
	}
	// Through JSON (as the model file stores it) the keys still apply.
	b, err := json.Marshal(f)
	if err != nil {
		t.Fatal(err)
	}
	var g Frozen
	if err := json.Unmarshal(b, &g); err != nil {
		t.Fatal(err)
	}
	if err := g.Prepare(); err != nil {
		t.Fatal(err)
	}
	for _, c := range cases {
		if a, b := f.Transform(c.in), g.Transform(c.in); !reflect.DeepEqual(a, b) {
			t.Errorf("%q: after JSON %+v, before %+v", c.in, b, a)
		}
	}
}

// TestSentencesOldSettings: a Frozen saved before the step (settings version 1, no
// "sentences" and no "boilerplate_sentences" in its JSON) loads and processes text exactly as
// before, keeping every sentence; a version newer than this program is refused with a clear
// error.
func TestSentencesOldSettings(t *testing.T) {
	s := plainSettings()
	s.Version = 1
	_, f := build(t, handCorpus, s)
	b, err := json.Marshal(f)
	if err != nil {
		t.Fatal(err)
	}
	if bytes.Contains(b, []byte(`"sentences"`)) || bytes.Contains(b, []byte("boilerplate_sentences")) {
		t.Fatalf("a pipeline without the step writes its fields: %s", b)
	}
	var g Frozen
	if err := json.Unmarshal(b, &g); err != nil {
		t.Fatal(err)
	}
	if err := g.Prepare(); err != nil {
		t.Fatal(err)
	}
	if d := g.Transform(handCorpus[2]); d.SetAside != 0 || len(d.Terms) != 13 {
		t.Errorf("old pipeline: %d terms, %d set aside; want 13, 0 (by hand: 5+2+3+3)", len(d.Terms), d.SetAside)
	}
	newer := bytes.Replace(b, []byte(`"version":1`), []byte(`"version":99`), 1)
	var h Frozen
	if err := json.Unmarshal(newer, &h); err != nil {
		t.Fatal(err)
	}
	if err := h.Prepare(); err == nil || !strings.Contains(err.Error(), "newer than this program") {
		t.Errorf("version 99: %v", err)
	}
}

// TestSentencesTransformMatchesBuild: with the step on, Frozen.Transform reproduces Build's
// rows exactly (the generated corpus, the hand corpus, and the OSHA abstracts with a low
// threshold so that many sentences are set aside; also with repair, joins and phrases on).
func TestSentencesTransformMatchesBuild(t *testing.T) {
	docs := append(genCorpus(600, 11), handCorpus...)
	docs = append(docs, "Veh icle stopped.\nVeh icle towed", "veh icle stopped. veh icle stopped. veh icle stopped.")
	if oshaPath != "" {
		docs = append(docs, loadOSHA(t, 1500)...)
	}
	for _, name := range []string{"defaults", "plain"} {
		s := DefaultSettings()
		if name == "plain" {
			s = plainSettings()
		}
		s.Sentences = SentenceSettings{Enabled: true, MinNarratives: 3, MinShare: 1e-9, Repeats: true}
		c, f := build(t, docs, s)
		if c.Sentences == nil || len(c.Sentences.Keys) == 0 {
			t.Fatalf("%s: no boilerplate found", name)
		}
		transformMatchesBuild(t, name, docs, c, f)
	}
}

// TestSentencesDeterministic: Build with the step on gives byte-identical output with
// GOMAXPROCS 1 and 4 (RULES: determinism), on more narratives than one block.
func TestSentencesDeterministic(t *testing.T) {
	docs := genCorpus(5000, 3)
	for i := range docs {
		if i%7 == 0 {
			docs[i] += " No further action. Code 4, 10-8."
		}
	}
	if oshaPath != "" {
		docs = append(docs, loadOSHA(t, 0)...)
	}
	s := DefaultSettings()
	s.Sentences = SentenceSettings{Enabled: true, Repeats: true}
	sameAtProcs(t, docs, s)
}

// TestSentencesSegmentation: the tokenizer's tokens cut as package sentences documents
// (the time token absorbs "a.m.", decimals and codes are single tokens). Expected keys by
// hand from that rule.
func TestSentencesSegmentation(t *testing.T) {
	cases := []struct{ in, want string }{
		{"At 9:45 a.m. on Main St. the alarm sounded. Checked the area.", "at [time] on main st the alarm sounded | checked the area"},
		{"Arrived 9:45 a.m. Checked the area.", "arrived [time] | checked the area"},
		{"Approx. 3.5 miles north; 10-50 reported. Code 4, 10-8.", "approx [number] miles north | 10-50 reported | code [number] 10-8"},
		// "'s" after a digit is not a possessive to the tokenizer: "s" stays a word.
		{"Employee #1's hand was caught\nEmployee #2 was not injured", "employee [number] s hand was caught | employee [number] was not injured"},
		{"On 8/10/2017 in the p.m. hours. No. 5 was open!", "on [date] in the p m hours | no [number] was open"},
		{"The driver&#39;s car. Stop&nbsp;&#46; Go", "the driver car | stop | go"},
	}
	var sc scanner
	var sp splitter
	for _, c := range cases {
		sc.scan(c.in, false)
		var parts []string
		for _, r := range sp.split(nil, &sc) {
			parts = append(parts, keyString(&sc, r))
		}
		if got := strings.Join(parts, " | "); got != c.want {
			t.Errorf("%q:\n got  %s\n want %s", c.in, got, c.want)
		}
	}
}

// readCorpus reads a public corpus the way the command does (intake.Read, redaction, the
// placeholders blanked) and fails when it is missing.
func readCorpus(t *testing.T, files []string) []string {
	t.Helper()
	if len(files) == 0 || files[0] == "" {
		t.Fatal("shared/corpora not found (set UNDERCURRENT_SHARED)")
	}
	set, err := intake.Read(context.Background(), files, nil, intake.Options{})
	if err != nil {
		t.Fatal(err)
	}
	red, err := redact.New(redact.Options{})
	if err != nil {
		t.Fatal(err)
	}
	docs := make([]string, len(set.Records))
	for i, r := range set.Records {
		out, _ := red.Redact(r.Text)
		docs[i] = redact.Blank(out)
	}
	return docs
}

// TestSentencesCorpora: on the OSHA accident abstracts and the SAFENET reports (public data,
// ../shared/corpora/SOURCES.md) the sentences the team counted by reading them are found, with
// the narrative counts measured by this code (read through intake and redaction as the
// command reads them; the team's counts, made with a simpler cut, were 205, 146, 118 and 10).
// With the default threshold (20 narratives and 0.5%), OSHA's three are boilerplate and
// SAFENET's disclaimers (10 narratives, under 20) are not; with 10 narratives and 0.2% they are.
func TestSentencesCorpora(t *testing.T) {
	osha := sharedPath("corpora/osha-abstracts/osha.csv")
	safenet, _ := filepath.Glob(filepath.Join(filepath.Dir(filepath.Dir(osha)), "safenet", "SAFENET_*.csv"))
	cases := []struct {
		name          string
		files         []string
		minNarratives int
		minShare      float64
		wantKeys      int // boilerplate keys (measured)
		want          map[string]int
	}{
		{"osha, defaults", []string{osha}, 0, 0, 7, map[string]int{
			"emergency services were called and employee [number] was transported to the hospital": 208,
			"the employee was killed":                                    148,
			"the employee was hospitalized and treated for his injuries": 121,
		}},
		{"safenet, defaults", safenet, 0, 0, 0, nil},
		{"safenet, 10 narratives and 0.2%", safenet, 10, 0.002, 3, map[string]int{
			"safenet submissions should be made on firsthand observation or participation in the identified event":                                 10,
			"submittals based solely on hearsay or other secondhand information and contain unprofessional content will not be posted":             10,
			"the views and opinions included in the narrative of this safenet belong to their author and do not meet the standard for publication": 10,
		}},
	}
	for _, tc := range cases {
		t.Run(tc.name, func(t *testing.T) {
			docs := readCorpus(t, tc.files)
			s := DefaultSettings()
			s.Sentences = SentenceSettings{Enabled: true, MinNarratives: tc.minNarratives, MinShare: tc.minShare, Repeats: true}
			c, _ := build(t, docs, s)
			r := c.Sentences
			got := map[string]int{}
			for _, k := range r.Keys {
				got[k.Key] = k.Narratives
			}
			for k, n := range tc.want {
				if got[k] != n {
					t.Errorf("%q: in %d narratives, want %d", k, got[k], n)
				}
			}
			if len(r.Keys) != tc.wantKeys {
				t.Errorf("%d boilerplate keys, want %d", len(r.Keys), tc.wantKeys)
			}
			t.Logf("%d narratives, threshold %d: %d keys; %d sentences (%d repeats in %d narratives), %d of %d tokens set aside; by sentences set aside %v",
				len(docs), r.Threshold, len(r.Keys), r.Sentences, r.Repeats, r.RepeatNarratives, r.Tokens, c.Tokens, r.Narratives)
		})
	}
}
