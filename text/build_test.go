package text

import (
	"bytes"
	"context"
	"encoding/json"
	"math"
	"os"
	"reflect"
	"runtime"
	"slices"
	"strings"
	"testing"

	"undercurrent/text/weight"
)

// plainSettings switch off every corpus-level step, for comparisons with reference tools.
func plainSettings() Settings {
	s := DefaultSettings()
	s.Abbrev.NoShipped = true
	s.Stop.Lists = nil
	s.Stem.Off = true
	s.Repair.Enabled = false
	s.Phrases.Enabled = false
	s.Routine = RoutineSettings{}
	s.Vocab = weight.Pruning{}
	return s
}

func build(t *testing.T, docs []string, s Settings) (*Corpus, *Frozen) {
	t.Helper()
	c, f, err := Build(context.Background(), docs, s)
	if err != nil {
		t.Fatal(err)
	}
	return c, f
}

// TestSklearnTfidfVectorizer compares the whole path (tokenize, count, weight) with Debian's
// python3-sklearn 1.2.1 TfidfVectorizer on an invented corpus (fixture made by
// testdata/gen_sklearn.py). Our MinLength 2 matches sklearn's token pattern \b\w\w+\b on this
// letters-only text.
func TestSklearnTfidfVectorizer(t *testing.T) {
	raw, err := os.ReadFile("testdata/sklearn_tfidf.json")
	if err != nil {
		t.Fatal(err)
	}
	var fx struct {
		Corpus   []string
		Variants map[string]struct {
			Vocab   []string
			IDF     []float64
			Weights [][]float64
		}
	}
	if err := json.Unmarshal(raw, &fx); err != nil {
		t.Fatal(err)
	}
	schemes := map[string]weight.Scheme{
		"default":              {TF: weight.TFRaw, IDF: weight.IDFSmooth, Norm: weight.NormL2},
		"plain_idf":            {TF: weight.TFRaw, IDF: weight.IDFPlain, Norm: weight.NormL2},
		"sublinear_plain_none": {TF: weight.TFLog, IDF: weight.IDFPlain, Norm: weight.NormNone},
		"binary":               {TF: weight.TFBinary, IDF: weight.IDFSmooth, Norm: weight.NormL2},
	}
	for name, v := range fx.Variants {
		s := plainSettings()
		s.Weight = schemes[name]
		c, _ := build(t, fx.Corpus, s)
		if !reflect.DeepEqual(c.Vocab, v.Vocab) {
			t.Fatalf("%s: vocab %v, sklearn %v", name, c.Vocab, v.Vocab)
		}
		w, idf := c.Weights()
		d := w.Dense()
		for j := range v.IDF {
			if math.Abs(idf[j]-v.IDF[j]) > 1e-12 {
				t.Errorf("%s: idf[%s] = %v, sklearn %v", name, v.Vocab[j], idf[j], v.IDF[j])
			}
		}
		for i := range v.Weights {
			for j := range v.Weights[i] {
				if math.Abs(d[i][j]-v.Weights[i][j]) > 1e-12 {
					t.Errorf("%s: w[%d][%s] = %v, sklearn %v", name, i, v.Vocab[j], d[i][j], v.Weights[i][j])
				}
			}
		}
	}
}

// Transform on the training narratives must give exactly the rows Build counted: the two code
// paths (ids in Build, strings in Frozen) implement one pipeline.
func TestTransformMatchesBuild(t *testing.T) {
	corpora := map[string][]string{"generated": genCorpus(400, 7)}
	if oshaPath != "" {
		corpora["osha"] = loadOSHA(t, 800)
	}
	for name, docs := range corpora {
		c, f := build(t, docs, DefaultSettings())
		if len(c.Vocab) == 0 {
			t.Fatalf("%s: empty vocabulary", name)
		}
		for i, d := range docs {
			doc := f.Transform(d)
			cols, vals := c.Counts.Row(i)
			got := map[int32]float64{}
			for _, id := range doc.Terms {
				got[id]++
			}
			want := map[int32]float64{}
			for k, col := range cols {
				want[col] = vals[k]
			}
			if !reflect.DeepEqual(got, want) {
				t.Fatalf("%s doc %d: Transform %v, Build %v\n%q", name, i, got, want, d)
			}
			for k, sp := range doc.Spans {
				if sp.Start < 0 || sp.End > len(d) || sp.Start > sp.End || sp.Term != doc.Terms[k] {
					t.Fatalf("%s doc %d: bad span %+v", name, i, sp)
				}
			}
			if c.Routine[i] != Duplicate && c.Routine[i] != doc.Routine {
				t.Fatalf("%s doc %d: routine %v vs %v", name, i, c.Routine[i], doc.Routine)
			}
		}
	}
}

// Same input and settings give byte-identical output (RULES: determinism).
func TestBuildDeterministic(t *testing.T) {
	docs := genCorpus(3000, 3)
	if oshaPath != "" {
		docs = append(docs, loadOSHA(t, 1500)...)
	}
	sameAtProcs(t, docs, DefaultSettings())
}

// sameAtProcs fails t unless Build of docs with s gives byte-identical corpus and frozen
// pipeline (as JSON) with GOMAXPROCS 1 and 4.
func sameAtProcs(t *testing.T, docs []string, s Settings) {
	t.Helper()
	enc := func(procs int) []byte {
		defer runtime.GOMAXPROCS(runtime.GOMAXPROCS(procs))
		c, f := build(t, docs, s)
		b, err := json.Marshal(struct {
			C *Corpus
			F *Frozen
		}{c, f})
		if err != nil {
			t.Fatal(err)
		}
		return b
	}
	if a, b := enc(1), enc(4); !bytes.Equal(a, b) {
		t.Fatal("builds with GOMAXPROCS 1 and 4 differ")
	}
}

func TestFrozenJSONRoundTrip(t *testing.T) {
	docs := genCorpus(200, 5)
	_, f := build(t, docs, DefaultSettings())
	b, err := json.Marshal(f)
	if err != nil {
		t.Fatal(err)
	}
	var g Frozen
	if err := json.Unmarshal(b, &g); err != nil {
		t.Fatal(err)
	}
	if !reflect.DeepEqual(g.Settings, f.Settings) {
		t.Fatalf("settings differ after JSON:\n%+v\n%+v", g.Settings, f.Settings)
	}
	if err := g.Prepare(); err != nil {
		t.Fatal(err)
	}
	for _, d := range docs[:50] {
		if a, b := f.Transform(d), g.Transform(d); !reflect.DeepEqual(a, b) {
			t.Fatalf("Transform differs after JSON round trip: %+v vs %+v", a, b)
		}
	}
	defer func() {
		if recover() == nil {
			t.Error("Transform before Prepare did not panic")
		}
	}()
	var h Frozen
	h.Transform("x")
}

func TestSettingsJSON(t *testing.T) {
	s := DefaultSettings()
	s.Abbrev.User = map[string]string{"ofc": "officer"}
	b, err := json.Marshal(s)
	if err != nil {
		t.Fatal(err)
	}
	var r Settings
	if err := json.Unmarshal(b, &r); err != nil {
		t.Fatal(err)
	}
	if !reflect.DeepEqual(r, s) {
		t.Fatalf("round trip:\n%+v\n%+v", r, s)
	}
	s.Tokens.Numbers = "round"
	if err := s.Validate(); err == nil {
		t.Error("bad policy accepted")
	}
	s = DefaultSettings()
	s.Routine.Hashes, s.Routine.Bands = 48, 8
	if err := s.Validate(); err == nil {
		t.Error("hashes not a power of two accepted")
	}
}

func repeat(s string, n int) []string {
	out := make([]string, n)
	for i := range out {
		out[i] = strings.ReplaceAll(s, "#", string(rune('a'+i%26)))
	}
	return out
}

// Planted noise: OCR confusions (0/o, 1/i, rn/m) and a split word, in a corpus where the
// right words are frequent. Expected corrections are the planted ones (by construction).
func TestRepairAudit(t *testing.T) {
	docs := repeat("the officer checked the vehicle near the market gate #x then the modern office", 30)
	docs = append(docs,
		"the 0fficer checked the veh1cle",
		"a rnodern vehicle",
		"the vehi cle was near the market",
		"the offices opened", // "offices" is an inflection of "office": left alone
	)
	s := DefaultSettings()
	s.Routine = RoutineSettings{}
	s.Vocab.MaxDocShare = 1
	s.Phrases.Enabled = false
	c, f := build(t, docs, s)
	got := map[string]string{}
	for _, a := range c.Audit {
		got[a.Kind+":"+a.From] = a.To
		if a.Count != 1 {
			t.Errorf("%+v: count", a)
		}
	}
	want := map[string]string{"ocr:0fficer": "officer", "ocr:veh1cle": "vehicle", "ocr:rnodern": "modern", "join:vehi cle": "vehicle"}
	if !reflect.DeepEqual(got, want) {
		t.Errorf("audit %v, want %v", got, want)
	}
	var b bytes.Buffer
	if err := c.WriteAudit(&b); err != nil {
		t.Fatal(err)
	}
	if !strings.HasPrefix(b.String(), "kind,from,to,cost,count\njoin,vehi cle,vehicle,0,1\n") {
		t.Errorf("audit CSV %q", b.String())
	}
	// Switched off: no corrections.
	s.Repair.Enabled = false
	if c, _ := build(t, docs, s); len(c.Audit) != 0 {
		t.Errorf("repair off but audit %v", c.Audit)
	}
	// The frozen table repairs new narratives the same way.
	d := f.Transform("the 0fficer")
	if len(d.Terms) != 1 || f.Display[d.Terms[0]] != "officer" {
		t.Errorf("frozen repair: %+v", d)
	}
}

func TestPhrasesAndDisplay(t *testing.T) {
	var docs []string
	for i := 0; i < 40; i++ {
		docs = append(docs, repeat("units made a traffic stop on # street and searched the vehicles", 1)[0])
		docs = append(docs, "the driver left his vehicle at the curb and walked "+string(rune('a'+i%26))+"x")
	}
	docs = append(docs, "vehicles vehicles") // display: "vehicles" (41+2) beats "vehicle" (40)
	s := DefaultSettings()
	s.Routine = RoutineSettings{}
	s.Sentences = SentenceSettings{} // the repeated sentences are the point here
	s.Vocab.MaxDocShare = 1
	c, f := build(t, docs, s)
	idx := slices.Index(c.Vocab, "traffic_stop")
	if idx < 0 {
		t.Fatalf("no traffic_stop phrase in %v", c.Vocab)
	}
	if c.Display[idx] != "traffic_stop" {
		t.Errorf("display %q", c.Display[idx])
	}
	v := slices.Index(c.Vocab, "vehicl")
	if v < 0 || c.Display[v] != "vehicles" {
		t.Errorf("vehicl display %v", c.Display)
	}
	// A phrase span covers both words in the original text.
	raw := "Made a Traffic  Stop today"
	d := f.Transform(raw)
	found := false
	for _, sp := range d.Spans {
		if sp.Term == int32(idx) {
			found = raw[sp.Start:sp.End] == "Traffic  Stop"
		}
	}
	if !found {
		t.Errorf("phrase span not found in %+v", d.Spans)
	}
}

// Display ties are broken alphabetically: "arrest" and "arrested" both twice, stem "arrest".
func TestDisplayTie(t *testing.T) {
	docs := []string{"arrest made", "arrested quickly", "arrest made", "arrested quickly"}
	s := plainSettings()
	s.Stem.Off = false
	c, _ := build(t, docs, s)
	i := slices.Index(c.Vocab, "arrest")
	if i < 0 || c.Display[i] != "arrest" {
		t.Errorf("vocab %v display %v", c.Vocab, c.Display)
	}
}

func TestExpansionsCounted(t *testing.T) {
	docs := []string{"subj fled in veh", "veh was towed", "RP called about the veh"}
	s := DefaultSettings()
	c, _ := build(t, docs, s)
	got := map[string]int{}
	for _, e := range c.Expansions {
		got[e.Abbrev] = e.Count
	}
	if want := map[string]int{"subj": 1, "veh": 3, "rp": 1}; !reflect.DeepEqual(got, want) {
		t.Errorf("expansions %v, want %v", got, want)
	}
}

func TestRoutine(t *testing.T) {
	long := "the tenant reported that a window of the back porch was broken overnight and a bicycle was taken from the yard near the garage"
	docs := []string{
		"GOA",
		"UTL",
		"UTL, GOA, cleared, no contact.",
		long, long, long + " nothing further",
		"an officer found the side gate open and a dog loose in the alley behind the bakery on elm street",
		"Shots fired.", // short but not routine
		"At 10:15 on 3/4/2026.",
	}
	c, _ := build(t, docs, DefaultSettings())
	want := []RoutineReason{RoutineWords, RoutineWords, RoutineWords, Duplicate, Duplicate, Duplicate, NotRoutine, NotRoutine, ShortContent}
	if !reflect.DeepEqual(c.Routine, want) {
		t.Errorf("routine %v, want %v", c.Routine, want)
	}
	if c.DupGroup[3] != 3 || c.DupGroup[5] != 3 || c.DupGroup[6] != -1 {
		t.Errorf("groups %v", c.DupGroup)
	}
}

func TestBuildCancelled(t *testing.T) {
	ctx, cancel := context.WithCancel(context.Background())
	cancel()
	if _, _, err := Build(ctx, []string{"a"}, DefaultSettings()); err == nil {
		t.Error("cancelled build succeeded")
	}
}

func TestSegmentsAndSuggestions(t *testing.T) {
	docs := genCorpus(300, 11)
	c, f := build(t, docs, DefaultSettings())
	for _, d := range docs[:40] {
		var b strings.Builder
		for _, seg := range f.Segments(d, nil) {
			b.WriteString(seg.Text)
		}
		if b.String() != d {
			t.Fatalf("segments do not rebuild %q", d)
		}
	}
	sug := c.SuggestStopwords(0.5)
	if len(sug) == 0 {
		t.Fatal("no suggestions on a templated corpus")
	}
	for i := 1; i < len(c.Common); i++ {
		if c.Common[i].Docs > c.Common[i-1].Docs {
			t.Fatal("Common not sorted")
		}
	}
}

// The frozen pipeline weights the training narratives exactly as Corpus.Weights does.
func TestFrozenWeights(t *testing.T) {
	docs := genCorpus(200, 13)
	c, f := build(t, docs, DefaultSettings())
	w, _ := c.Weights()
	if got := f.Weights(docs); !reflect.DeepEqual(got.Dense(), w.Dense()) {
		t.Error("Frozen.Weights differs from Corpus.Weights on the training narratives")
	}
}

// Degenerate corpora build without error or panic.
func TestBuildDegenerate(t *testing.T) {
	for _, docs := range [][]string{nil, {""}, {"", "  ", "<br />"}, {"the a of", "12 34"}, {"\xff\xfe"}} {
		c, f := build(t, docs, DefaultSettings())
		if c.Counts.Rows != len(docs) || len(c.Routine) != len(docs) {
			t.Errorf("%q: rows %d routine %d", docs, c.Counts.Rows, len(c.Routine))
		}
		f.Transform("anything at all")
		c.Weights()
	}
	s := DefaultSettings()
	s.Stop.Lists = []string{"klingon"}
	if _, _, err := Build(context.Background(), []string{"a"}, s); err == nil {
		t.Error("unknown stopword list accepted")
	}
}

// Transform matches Build under non-default settings too (every switch that changes the
// token path).
func TestTransformMatchesBuildVariants(t *testing.T) {
	docs := genCorpus(300, 17)
	docs = append(docs, "The driver's veh1cle was on Alder Ct at 10-50 w/ the 0fficer", "vehi cle vehi cle")
	variants := map[string]func(*Settings){
		"keep possessive": func(s *Settings) { s.Tokens.KeepPossessive = true },
		"placeholders": func(s *Settings) {
			s.Tokens = TokenSettings{Numbers: Placeholder, Times: Placeholder, Dates: Placeholder, Codes: Placeholder}
		},
		"no stemming": func(s *Settings) { s.Stem.Off = true },
		"no shipped abbreviations, user table": func(s *Settings) {
			s.Abbrev = AbbrevSettings{NoShipped: true, User: map[string]string{"veh": "car", "rp": "caller"}}
		},
		"user stopwords and keep": func(s *Settings) {
			s.Stop.User = []string{"vehicle", "street"}
			s.Stop.Keep = []string{"the"}
		},
		"plain-edit repair": func(s *Settings) { s.Repair.MaxCost, s.Repair.ShortMaxCost = 1, 1 },
		"no join":           func(s *Settings) { s.Repair.NoJoin = true },
		"tight vocabulary":  func(s *Settings) { s.Vocab = weight.Pruning{MinDocs: 3, MaxDocShare: 0.5, MaxTerms: 40} },
	}
	for name, mod := range variants {
		s := DefaultSettings()
		mod(&s)
		c, f := build(t, docs, s)
		transformMatchesBuild(t, name, docs, c, f)
		if name == "tight vocabulary" && len(c.Vocab) > 40 {
			t.Errorf("MaxTerms: %d terms", len(c.Vocab))
		}
	}
}

// A huge glued token (a pasted blob) neither slows repair down nor breaks the build.
func TestHugeToken(t *testing.T) {
	docs := genCorpus(50, 3)
	for i := 0; i < 12; i++ { // frequent, so it is a repair and join target too
		docs = append(docs, strings.Repeat("abcdefghij", 20000))
	}
	c, _ := build(t, docs, DefaultSettings())
	if c.Counts.Rows != len(docs) {
		t.Fatal("rows")
	}
}

// transformMatchesBuild fails t unless the frozen pipeline f gives every narrative of docs
// the same term counts as row i of c, the Build that made f.
func transformMatchesBuild(t *testing.T, name string, docs []string, c *Corpus, f *Frozen) {
	t.Helper()
	for i, d := range docs {
		got := map[int32]float64{}
		for _, id := range f.Transform(d).Terms {
			got[id]++
		}
		cols, vals := c.Counts.Row(i)
		want := map[int32]float64{}
		for k, col := range cols {
			want[col] = vals[k]
		}
		if !reflect.DeepEqual(got, want) {
			t.Fatalf("%s, doc %d: Transform %v, Build %v\n%q", name, i, got, want, d)
		}
	}
}
