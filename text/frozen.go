package text

import (
	"slices"
	"strings"
	"sync"

	"undercurrent/text/sentences"
	"undercurrent/text/sparse"
	"undercurrent/text/weight"
)

// Frozen is a pipeline fixed by Build: its settings, vocabulary, phrases, repair and join
// tables and display forms. It is saved with every model (all exported fields are
// JSON-serialisable) and applies exactly the same processing to new narratives, one at a
// time. After loading a Frozen from JSON call Prepare once. Transform is safe for concurrent
// use (calls are serialised).
type Frozen struct {
	Settings Settings          `json:"settings"`
	Vocab    []string          `json:"vocab"`    // term keys, ascending
	Display  []string          `json:"display"`  // display form of each term
	DocFreq  []int             `json:"doc_freq"` // training document frequency of each term
	Docs     int               `json:"docs"`     // training narratives
	Phrases  [][2]string       `json:"phrases"`  // stem pairs merged into one term, by score
	Repairs  map[string]string `json:"repairs"`  // OCR repairs: rare word → frequent word
	Joins    map[string]string `json:"joins"`    // split words: "a b" → "ab"
	// Sentences are the boilerplate sentence keys found by Build (ascending; see
	// SentenceReport.Keys): a sentence of a new narrative with one of these keys is set aside
	// whatever the batch, as are repeats within a narrative when Settings.Sentences.Repeats.
	// Absent in models made before the step (their settings have it off).
	Sentences []string `json:"boilerplate_sentences,omitempty"`

	mu       sync.Mutex
	prepared bool
	lx       *lexer
	sc       scanner
	vocabID  map[string]int32
	phraseOf map[[2]string]string
	lexMemo  map[string][]lexWord
	joinLeft map[string]bool
	items    []item
	routine  map[string]bool
	bpHash   map[uint64]bool
	sp       splitter
	recs     []sentRec
	why      []uint8
	drop     []bool
}

type item struct {
	stem       string
	start, end int
	protected  bool
	brk        bool
}

// Span ties a stretch of the original narrative to a vocabulary term: raw[Start:End] is where
// the writer wrote the term (for a phrase, both words and what lies between).
type Span struct {
	Start, End int
	Term       int32
}

// Doc is one narrative as the Frozen pipeline sees it.
type Doc struct {
	Terms   []int32       // vocabulary ids in narrative order (out-of-vocabulary terms left out)
	Spans   []Span        // one per entry of Terms
	Content int           // content terms before vocabulary pruning
	Routine RoutineReason // ShortContent or RoutineWords (near duplicates are found by Build only)
	// SetAside counts the sentences set aside by the sentence step (boilerplate and repeats).
	SetAside int `json:",omitempty"`
}

// Prepare builds the lookup tables. It returns an error when the settings are unusable.
func (f *Frozen) Prepare() error {
	f.mu.Lock()
	defer f.mu.Unlock()
	if err := f.Settings.Validate(); err != nil {
		return err
	}
	lx, err := newLexer(&f.Settings)
	if err != nil {
		return err
	}
	f.lx = lx
	f.vocabID = make(map[string]int32, len(f.Vocab))
	for i, v := range f.Vocab {
		f.vocabID[v] = int32(i)
	}
	f.phraseOf = make(map[[2]string]string, len(f.Phrases))
	for _, p := range f.Phrases {
		f.phraseOf[p] = p[0] + "_" + p[1]
	}
	f.lexMemo = make(map[string][]lexWord)
	f.joinLeft = make(map[string]bool, len(f.Joins))
	for k := range f.Joins {
		a, _, _ := strings.Cut(k, " ")
		f.joinLeft[a] = true
	}
	f.routine = make(map[string]bool)
	for _, w := range f.Settings.Routine.Words {
		w = strings.ToLower(strings.TrimSpace(w))
		if w == "" {
			continue
		}
		st := w
		if !f.Settings.Stem.Off {
			st = StemWord(w)
		}
		f.routine[st] = true
	}
	for _, p := range f.Phrases {
		if f.routine[p[0]] && f.routine[p[1]] {
			f.routine[p[0]+"_"+p[1]] = true // a phrase of routine words is routine
		}
	}
	f.bpHash = make(map[uint64]bool, len(f.Sentences))
	for _, k := range f.Sentences {
		f.bpHash[sentences.Hash(k)] = true
	}
	f.prepared = true
	return nil
}

// setAside marks in f.drop the tokens of the narrative just scanned that the sentence step sets
// aside (the same judgement as Build's) and returns how many sentences it set aside; it
// returns 0 and leaves f.drop nil when the step is off.
func (f *Frozen) setAside() int {
	ss := f.Settings.Sentences
	f.drop = f.drop[:0]
	if !ss.Enabled || (len(f.bpHash) == 0 && !ss.Repeats) {
		f.drop = nil
		return 0
	}
	f.recs = f.sp.split(f.recs[:0], &f.sc)
	f.why = f.sp.judge(f.why, f.recs, func(h uint64) bool { return f.bpHash[h] }, ss.Repeats, ss.minTokens())
	f.drop = slices.Grow(f.drop, len(f.sc.toks))[:len(f.sc.toks)]
	clear(f.drop)
	n := 0
	for i, r := range f.recs {
		if f.why[i] != sentKept {
			n++
			for t := r.lo; t < r.hi; t++ {
				f.drop[t] = true
			}
		}
	}
	if n == 0 {
		f.drop = nil
	}
	return n
}

func (f *Frozen) lex(text string, kind Kind) []lexWord {
	if le, ok := f.lexMemo[text]; ok {
		return le
	}
	words, _ := f.lx.lex(text, kind)
	le := append([]lexWord(nil), words...)
	if len(f.lexMemo) < 1<<20 {
		f.lexMemo[text] = le
	}
	return le
}

// Transform applies the frozen pipeline to one narrative. It panics if the Frozen was not
// prepared (a caller bug).
func (f *Frozen) Transform(raw string) Doc {
	f.mu.Lock()
	defer f.mu.Unlock()
	if !f.prepared {
		panic("text: Frozen.Transform before Prepare")
	}
	s := &f.Settings
	sc := &f.sc
	sc.scan(raw, s.Tokens.KeepPossessive)
	items := f.items[:0]
	brk := func() {
		if len(items) > 0 && !items[len(items)-1].brk {
			items = append(items, item{brk: true})
		}
	}
	joinOn := s.Repair.Enabled && !s.Repair.NoJoin && len(f.Joins) > 0
	setAside := f.setAside()
	drop := f.drop
	toks := sc.toks
	for i := 0; i < len(toks); i++ {
		t := toks[i]
		if t.brk {
			brk()
		}
		if drop != nil && drop[i] {
			brk() // set aside: a break stands in its place
			continue
		}
		start, end := sc.nb.rawSpan(int(t.s), int(t.e))
		b := sc.text[t.a:t.b]
		var le []lexWord
		replaced := false
		if joinOn && i+1 < len(toks) && !toks[i+1].brk && (drop == nil || !drop[i+1]) && f.joinLeft[string(b)] {
			n := toks[i+1]
			if j, ok := f.Joins[string(b)+" "+string(sc.text[n.a:n.b])]; ok {
				le, replaced = f.lex(j, Word), true
				_, end = sc.nb.rawSpan(int(n.s), int(n.e))
				i++
			}
		}
		if !replaced {
			if r, ok := f.Repairs[string(b)]; ok {
				le, replaced = f.lex(r, Word), true
			}
		}
		if !replaced {
			var ok bool
			if le, ok = f.lexMemo[string(b)]; !ok {
				le = f.lex(string(b), t.kind)
			}
		}
		if len(le) == 0 {
			brk()
			continue
		}
		for _, w := range le {
			items = append(items, item{stem: w.stem, start: start, end: end, protected: w.protected})
		}
	}
	f.items = items
	d := Doc{SetAside: setAside}
	allRoutine := len(f.routine) > 0
	for k := 0; k < len(items); {
		it := items[k]
		if it.brk {
			k++
			continue
		}
		term := it.stem
		end := it.end
		k++
		if len(f.phraseOf) > 0 && !it.protected && k < len(items) && !items[k].brk && !items[k].protected {
			if p, ok := f.phraseOf[[2]string{it.stem, items[k].stem}]; ok {
				term, end = p, items[k].end
				k++
			}
		}
		d.Content++
		if !f.routine[term] {
			allRoutine = false
		}
		if id, ok := f.vocabID[term]; ok {
			if d.Terms == nil {
				// Sized once for the items left: no regrowth (nil stays nil when no term is found).
				n := len(items) - k + 1
				d.Terms, d.Spans = make([]int32, 0, n), make([]Span, 0, n)
			}
			d.Terms = append(d.Terms, id)
			d.Spans = append(d.Spans, Span{it.start, end, id})
		}
	}
	switch {
	case d.Content == 0 || d.Content <= s.Routine.MaxContent:
		d.Routine = ShortContent
	case allRoutine && d.Content > 0:
		d.Routine = RoutineWords
	}
	return d
}

// Counts returns the document-term count matrix of narratives under the frozen vocabulary.
func (f *Frozen) Counts(docs []string) *sparse.Matrix {
	b := sparse.NewBuilder(len(f.Vocab))
	for _, raw := range docs {
		b.AddCounts(f.Transform(raw).Terms)
	}
	return b.Matrix()
}

// IDF returns the training idf of each term under the frozen weighting scheme, so new
// narratives are weighted as the training narratives were.
func (f *Frozen) IDF() []float64 {
	return weight.IDFWeights(nil, f.DocFreq, f.Docs, f.Settings.Weight.IDF)
}

// Weights returns the TF-IDF weights of new narratives under the frozen vocabulary, scheme
// and training idf.
func (f *Frozen) Weights(docs []string) *sparse.Matrix {
	return weight.TFIDFWith(f.Counts(docs), f.Settings.Weight, f.IDF())
}

// Segment is a piece of a narrative for highlighting: Text is a stretch of the original
// narrative and Term the vocabulary id it shows (-1 for text between terms).
type Segment struct {
	Text string
	Term int32
}

// Segments cuts raw into consecutive segments, one for each vocabulary term found (Transform's
// spans) for which hit returns true (hit nil: every term), and one for the text between.
// Overlapping spans (a phrase over its words, an abbreviation's expansions) keep the first.
// Concatenating the segments' texts gives raw back.
func (f *Frozen) Segments(raw string, hit func(term int32) bool) []Segment {
	d := f.Transform(raw)
	var out []Segment
	pos := 0
	for _, sp := range d.Spans {
		if sp.Start < pos || (hit != nil && !hit(sp.Term)) {
			continue
		}
		if sp.Start > pos {
			out = append(out, Segment{raw[pos:sp.Start], -1})
		}
		out = append(out, Segment{raw[sp.Start:sp.End], sp.Term})
		pos = sp.End
	}
	if pos < len(raw) {
		out = append(out, Segment{raw[pos:], -1})
	}
	return out
}
