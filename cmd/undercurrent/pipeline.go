package main

import (
	"bufio"
	"context"
	"crypto/sha256"
	"encoding/hex"
	"encoding/json"
	"errors"
	"flag"
	"fmt"
	"io"
	"os"
	"path/filepath"
	"runtime"
	"sort"
	"strconv"
	"strings"
	"sync"
	"sync/atomic"

	"undercurrent/stopwords"
	"undercurrent/text"
	"undercurrent/text/intake"
	"undercurrent/text/redact"
	"undercurrent/text/sparse"
	"undercurrent/topics"
)

// textFlags choose the user's word tables for the text pipeline.
type textFlags struct {
	abbrev, stop, keep, words string
	noRepair, noPhrases       bool
	minDocs                   int
	maxDocShare               float64
	setAsideRepeated          bool // leave boilerplate sentences out of the counts
	repeatedIn                int  // narratives a sentence must be found in to be boilerplate
}

func (f *textFlags) register(fs *flag.FlagSet) {
	fs.StringVar(&f.abbrev, "abbrev", "", "file of extra abbreviations, one \"abbr = expansion\" a line (adds to or overrides the shipped table)")
	fs.StringVar(&f.stop, "stopwords", "", "file of extra stopwords, one a line, # comments")
	fs.StringVar(&f.keep, "keep-words", "", "file of words never treated as stopwords")
	fs.StringVar(&f.words, "words", "", "file of correct words (local street and place names) that OCR repair may map to and never changes")
	fs.BoolVar(&f.noRepair, "no-repair", false, "switch off OCR-noise repair")
	fs.BoolVar(&f.noPhrases, "no-phrases", false, "switch off phrase (collocation) detection")
	fs.BoolVar(&f.setAsideRepeated, "set-aside-repeated-sentences", false, "leave sentences repeated word for word across many narratives (disclaimers, sign-offs, procedure) or within one narrative out of the counts, and list them in boilerplate-sentences.csv; off by default, because a sentence many writers legitimately repeat is set aside too")
	fs.IntVar(&f.repeatedIn, "repeated-in", 0, "with -set-aside-repeated-sentences: a sentence found in at least this many narratives (and at least 0.5% of them) is boilerplate (default 20)")
	fs.IntVar(&f.minDocs, "min-docs", 0, "drop words found in fewer narratives (default: the pipeline's)")
	fs.Float64Var(&f.maxDocShare, "max-doc-share", 0, "drop words found in more than this share of narratives (default: the pipeline's)")
}

// readWordFile reads one word or phrase a line, skipping blank lines and # comments.
func readWordFile(path string) ([]string, error) {
	f, err := os.Open(path)
	if err != nil {
		return nil, err
	}
	defer f.Close()
	var out []string
	sc := bufio.NewScanner(f)
	sc.Buffer(make([]byte, 64*1024), 1024*1024)
	for sc.Scan() {
		line := sc.Text()
		if i := strings.IndexByte(line, '#'); i >= 0 {
			line = line[:i]
		}
		if line = strings.TrimSpace(line); line != "" {
			out = append(out, line)
		}
	}
	if err := sc.Err(); err != nil {
		return nil, fmt.Errorf("%s: %w", path, err)
	}
	return out, nil
}

func (f *textFlags) settings() (text.Settings, error) {
	s := text.DefaultSettings()
	if f.abbrev != "" {
		fh, err := os.Open(f.abbrev)
		if err != nil {
			return s, err
		}
		user, err := text.ParseAbbrev(f.abbrev, fh)
		fh.Close()
		if err != nil {
			return s, err
		}
		s.Abbrev.User = user
	}
	if f.stop != "" {
		set := &stopwords.Set{}
		fh, err := os.Open(f.stop)
		if err != nil {
			return s, err
		}
		err = set.Load(fh)
		fh.Close()
		if err != nil {
			return s, fmt.Errorf("%s: %w", f.stop, err)
		}
		s.Stop.User = set.Words()
	}
	if f.keep != "" {
		w, err := readWordFile(f.keep)
		if err != nil {
			return s, err
		}
		s.Stop.Keep = w
	}
	if f.words != "" {
		w, err := readWordFile(f.words)
		if err != nil {
			return s, err
		}
		s.Repair.Words = w
	}
	if f.noRepair {
		s.Repair.Enabled = false
	}
	if f.noPhrases {
		s.Phrases.Enabled = false
	}
	if f.setAsideRepeated {
		s.Sentences.Enabled, s.Sentences.Repeats = true, true
	}
	if f.repeatedIn < 0 {
		return s, usagef("-repeated-in %d: want at least 2", f.repeatedIn)
	}
	if f.repeatedIn > 0 {
		s.Sentences.MinNarratives = f.repeatedIn
	}
	if f.minDocs > 0 {
		s.Vocab.MinDocs = f.minDocs
	}
	if f.maxDocShare > 0 {
		s.Vocab.MaxDocShare = f.maxDocShare
	}
	return s, s.Validate()
}

// redactFlags configure the redactor. Redaction cannot be switched off for anything that is
// published; raw text goes only to files whose names contain "private".
type redactFlags struct {
	names, allow  string
	privateReview bool
	noGuessNames  bool
}

func (f *redactFlags) register(fs *flag.FlagSet) {
	fs.StringVar(&f.names, "names", "", "file of people's names to redact wherever they appear (one a line)")
	fs.StringVar(&f.allow, "allow", "", "file of street, business and place names that must never be redacted as names")
	fs.BoolVar(&f.privateReview, "private-review", false, "also write redaction-review.private.csv: every redaction with its raw context, for a person to check (holds the very text redaction removes)")
	fs.BoolVar(&f.noGuessNames, "no-guess-names", false, "do not treat capitalised non-dictionary words in name position as names")
}

func (f *redactFlags) redactor() (*redact.Redactor, error) {
	var opt redact.Options
	var err error
	if f.names != "" {
		if opt.Names, err = readWordFile(f.names); err != nil {
			return nil, err
		}
	}
	if f.allow != "" {
		if opt.Allow, err = readWordFile(f.allow); err != nil {
			return nil, err
		}
	}
	opt.NoHeuristicNames = f.noGuessNames
	return redact.New(opt)
}

// prepared is the input after reading, redaction and the text pipeline.
type prepared struct {
	set       *intake.Set
	published []string        // redacted narratives: the only text that is ever shown
	spans     [][]redact.Span // redactions per narrative
	counts    redact.Counts   // redactions per type
	corpus    *text.Corpus    // built on the blanked published text
	frozen    *text.Frozen    // the pipeline, frozen for tagging
	fitRows   []int           // narratives the models are fitted on (routine ones left out)
	inputHash string          // sha256 of the input files' bytes, in order
	settings  text.Settings   // text pipeline settings used
	abbrevN   map[string]int  // expansions by abbreviation
	routineN  map[string]int  // routine narratives by reason
	fitCounts *sparse.Matrix  // counts restricted to fitRows
	seedNoted bool            // the seed-word notes were printed (once a run)
}

// prepare reads the inputs, accounts for every row, redacts, and runs the text pipeline.
func prepare(ctx context.Context, e *env, in *inputFlags, tf *textFlags, rf *redactFlags, outDir string, args []string) (*prepared, error) {
	ts, err := tf.settings()
	if err != nil {
		return nil, err
	}
	red, err := rf.redactor()
	if err != nil {
		return nil, err
	}
	set, err := readInputs(ctx, e, in, args)
	if err != nil {
		return nil, err
	}
	if len(set.Records) == 0 {
		return nil, errors.New("no narratives left to analyse after reading (see rejects.csv)")
	}
	p := &prepared{set: set, settings: ts}
	p.inputHash = hashInputs(args)
	if outDir != "" {
		if err := writeFileAtomic(filepath.Join(outDir, "rejects.csv"), func(w io.Writer) error {
			return intake.WriteRejects(w, set.Rejects)
		}); err != nil {
			return nil, err
		}
	}

	prog := newProgress(e, "redacting", len(set.Records))
	p.published = make([]string, len(set.Records))
	p.spans = make([][]redact.Span, len(set.Records))
	blanked := make([]string, len(set.Records))
	// Narratives are independent: redact them on every core in blocks of 256, each result
	// stored at its own index, so the outcome does not depend on scheduling.
	const block = 256
	var next atomic.Int64
	var wg sync.WaitGroup
	workers := runtime.GOMAXPROCS(0)
	for w := 0; w < workers; w++ {
		wg.Add(1)
		go func() {
			defer wg.Done()
			for {
				lo := int(next.Add(block)) - block
				if lo >= len(set.Records) || ctx.Err() != nil {
					return
				}
				hi := min(lo+block, len(set.Records))
				for i := lo; i < hi; i++ {
					out, sp := red.Redact(set.Records[i].Text)
					p.published[i], p.spans[i] = out, sp
					blanked[i] = redact.Blank(out)
				}
				prog.add(hi - lo)
			}
		}()
	}
	wg.Wait()
	if err := ctx.Err(); err != nil {
		return nil, err
	}
	for _, sp := range p.spans {
		p.counts.Add(sp)
	}
	prog.done()
	if rf.privateReview && outDir != "" {
		path := filepath.Join(outDir, "redaction-review.private.csv")
		if err := writeFileAtomic(path, func(w io.Writer) error {
			rw := redact.NewReviewWriter(w)
			for i, r := range set.Records {
				if len(p.spans[i]) > 0 {
					if err := rw.Write(r.ID, r.Text, p.spans[i]); err != nil {
						return err
					}
				}
			}
			return rw.Flush()
		}); err != nil {
			return nil, err
		}
		fmt.Fprintf(e.stderr, "wrote %s (PRIVATE: raw text around each redaction; do not publish)\n", path)
	}

	fmt.Fprintf(e.stderr, "text pipeline: %d narratives\n", len(blanked))
	corpus, frozen, err := text.Build(ctx, blanked, ts)
	if err != nil {
		return nil, err
	}
	p.corpus, p.frozen = corpus, frozen
	if r := corpus.Sentences; r != nil {
		fmt.Fprintf(e.stderr, "boilerplate sentences: %d found in at least %d narratives; %d sentences (%d repeats within a narrative), %d words set aside from the counts\n",
			len(r.Keys), r.Threshold, r.Sentences, r.Repeats, r.Tokens)
	}
	p.abbrevN = map[string]int{}
	for _, x := range corpus.Expansions {
		p.abbrevN[x.Abbrev] += x.Count
	}
	p.routineN = map[string]int{}
	for i, r := range corpus.Routine {
		if r == text.NotRoutine {
			p.fitRows = append(p.fitRows, i)
		} else {
			p.routineN[r.String()]++
		}
	}
	if len(p.fitRows) == 0 {
		return nil, errors.New("every narrative was set aside as routine; nothing to fit")
	}
	p.fitCounts = subRows(corpus.Counts, p.fitRows)
	fmt.Fprintf(e.stderr, "vocabulary %d terms; %d narratives to fit, %d routine set aside\n",
		len(corpus.Vocab), len(p.fitRows), len(corpus.Routine)-len(p.fitRows))
	return p, nil
}

// subRows returns the rows of m listed in rows, in that order.
func subRows(m *sparse.Matrix, rows []int) *sparse.Matrix {
	b := sparse.NewBuilder(m.Cols)
	for _, r := range rows {
		c, v := m.Row(r)
		b.AddRow(c, v)
	}
	return b.Matrix()
}

// hashInputs returns "sha256:<hex>" over the bytes of every input file in order (a folder's
// files in name order; stdin is not hashed and marked as such).
func hashInputs(paths []string) string {
	h := sha256.New()
	for _, p := range paths {
		if p == "-" {
			io.WriteString(h, "stdin\x00")
			continue
		}
		hashPath(h, p)
	}
	return "sha256:" + hex.EncodeToString(h.Sum(nil))
}

func hashPath(h io.Writer, p string) {
	st, err := os.Stat(p)
	if err != nil {
		return
	}
	if st.IsDir() {
		ents, _ := os.ReadDir(p)
		names := make([]string, 0, len(ents))
		for _, e := range ents {
			names = append(names, e.Name())
		}
		sort.Strings(names)
		for _, n := range names {
			hashPath(h, filepath.Join(p, n))
		}
		return
	}
	f, err := os.Open(p)
	if err != nil {
		return
	}
	defer f.Close()
	io.WriteString(h, filepath.Base(p)+"\x00")
	io.Copy(h, f)
}

// modelFlags choose the number of themes and the fitting.
type modelFlags struct {
	themes     int
	krange     string
	seed       uint64
	iterations int
	chains     int
	seedsFile  string
}

func (f *modelFlags) register(fs *flag.FlagSet) {
	fs.IntVar(&f.themes, "themes", 0, "number of themes K (default: chosen by a sweep over -k-range)")
	fs.StringVar(&f.krange, "k-range", "6,8,10,12,14,16", "numbers of themes the sweep compares: a list (6,8,10) or a range with step (6-16/2)")
	fs.Uint64Var(&f.seed, "seed", 1, "random seed; the same input, settings and seed give byte-identical outputs")
	fs.IntVar(&f.iterations, "iterations", 0, "Gibbs sweeps per fit (default: the model's, 300)")
	fs.IntVar(&f.chains, "chains", 2, "independent chains of the final fit; their agreement is reported as stability")
	fs.StringVar(&f.seedsFile, "seed-words", "", "file naming guided themes by seed words (see 'undercurrent help fit')")
}

func parseKRange(s string) ([]int, error) {
	var out []int
	if strings.Contains(s, "-") && !strings.Contains(s, ",") {
		step := 1
		r := s
		if i := strings.IndexByte(s, '/'); i >= 0 {
			st, err := strconv.Atoi(s[i+1:])
			if err != nil || st < 1 {
				return nil, usagef("-k-range %q: bad step", s)
			}
			step, r = st, s[:i]
		}
		a, b, ok := strings.Cut(r, "-")
		lo, err1 := strconv.Atoi(a)
		hi, err2 := strconv.Atoi(b)
		if !ok || err1 != nil || err2 != nil || lo < 1 || hi < lo {
			return nil, usagef("-k-range %q: want lo-hi[/step] or a comma list", s)
		}
		for k := lo; k <= hi; k += step {
			out = append(out, k)
		}
		return out, nil
	}
	for _, p := range splitList(s) {
		k, err := strconv.Atoi(p)
		if err != nil || k < 1 {
			return nil, usagef("-k-range %q: %q is not a number of themes", s, p)
		}
		out = append(out, k)
	}
	if len(out) == 0 {
		return nil, usagef("-k-range is empty")
	}
	sort.Ints(out)
	return out, nil
}

// check validates the model options before any input is read (usage errors, exit 2).
func (f *modelFlags) check() error {
	if f.themes < 0 {
		return usagef("-themes %d: want at least 1 (or leave it out to choose K by a sweep)", f.themes)
	}
	if f.chains < 1 {
		return usagef("-chains %d: want at least 1", f.chains)
	}
	if f.iterations < 0 {
		return usagef("-iterations %d: want at least 1", f.iterations)
	}
	if f.themes == 0 {
		if _, err := parseKRange(f.krange); err != nil {
			return err
		}
	}
	return nil
}

func (f *modelFlags) fitSettings(e *env, p *prepared) (topics.Settings, error) {
	s := topics.Settings{K: f.themes, Seed: f.seed, Iterations: f.iterations, Chains: f.chains}
	if f.seedsFile != "" {
		fh, err := os.Open(f.seedsFile)
		if err != nil {
			return s, err
		}
		defer fh.Close()
		seeds, err := topics.ReadSeedThemes(fh, f.seedsFile)
		if err != nil {
			return s, err
		}
		seeds, err = p.seedTerms(e, f.seedsFile, phraseSeeds(seeds))
		if err != nil {
			return s, err
		}
		s.Seeds = seeds
	}
	return s, nil
}

// seedTerms maps seed words as a person writes them ("resisted", "mental health") to the
// vocabulary's terms by the same text processing ("resist", "mental_health"): a word that is
// a term already stays; otherwise the frozen pipeline's single term for it, or its terms
// joined as a phrase when that is a term. A word that matches no term (absent from this
// corpus, or pruned from its vocabulary) is left out with a note on stderr, so that one seed
// file serves every refit; a theme left with no word at all is an error.
func (p *prepared) seedTerms(e *env, file string, seeds []topics.SeedTheme) ([]topics.SeedTheme, error) {
	vocab := p.corpus.Vocab
	has := func(w string) bool {
		i := sort.SearchStrings(vocab, w)
		return i < len(vocab) && vocab[i] == w
	}
	for i := range seeds {
		var kept []string
		for _, w := range seeds[i].Words {
			term := w
			if !has(term) {
				doc := p.frozen.Transform(strings.ReplaceAll(w, "_", " "))
				parts := make([]string, len(doc.Terms))
				for k, t := range doc.Terms {
					parts[k] = vocab[t]
				}
				term = strings.Join(parts, "_")
			}
			if term == "" || !has(term) {
				if p.seedNoted {
					continue
				}
				fmt.Fprintf(e.stderr, "note: %s:%d: seed word %q of theme %q is not in this corpus's vocabulary; left out\n",
					file, seeds[i].Line, strings.ReplaceAll(w, "_", " "), seeds[i].Name)
				continue
			}
			kept = append(kept, term)
		}
		if len(kept) == 0 {
			return nil, fmt.Errorf("%s:%d: no seed word of theme %q is in this corpus's vocabulary", file, seeds[i].Line, seeds[i].Name)
		}
		seeds[i].Words = kept
	}
	p.seedNoted = true
	return seeds, nil
}

// topicsCorpus is the fitting input: the non-routine narratives' counts and the frozen
// pipeline, stored verbatim in the model file.
func (p *prepared) topicsCorpus() (topics.Corpus, error) {
	blob, err := json.Marshal(p.frozen)
	if err != nil {
		return topics.Corpus{}, err
	}
	return topics.Corpus{Counts: p.fitCounts, Vocabulary: p.corpus.Vocab, Display: p.corpus.Display, Pipeline: blob}, nil
}

// chooseK runs the sweep when no K was given and returns the chosen K and the table.
func chooseK(ctx context.Context, e *env, p *prepared, mf *modelFlags) (int, *topics.SweepTable, error) {
	ks, err := parseKRange(mf.krange)
	if err != nil {
		return 0, nil, err
	}
	fs, err := mf.fitSettings(e, p)
	if err != nil {
		return 0, nil, err
	}
	c, err := p.topicsCorpus()
	if err != nil {
		return 0, nil, err
	}
	fs.Chains = 1
	if fs.Iterations == 0 {
		fs.Iterations = 200
	}
	total := 0
	prog := newProgress(e, "choosing the number of themes", len(ks)*2)
	fs.Progress = nil
	sw := topics.SweepSettings{Ks: ks, Fit: fs}
	_ = total
	tab, err := topics.Sweep(ctx, c, sw)
	prog.done()
	if err != nil {
		return 0, nil, err
	}
	if mf.themes > 0 {
		return mf.themes, tab, nil
	}
	return tab.Recommended, tab, nil
}

// fitModel fits the final model with K themes.
func fitModel(ctx context.Context, e *env, p *prepared, mf *modelFlags, k int) (*topics.Model, error) {
	fs, err := mf.fitSettings(e, p)
	if err != nil {
		return nil, err
	}
	fs.K = k
	c, err := p.topicsCorpus()
	if err != nil {
		return nil, err
	}
	prog := newProgress(e, fmt.Sprintf("fitting %d themes", k), 0)
	fs.Progress = prog.set
	m, err := topics.Fit(ctx, c, fs)
	prog.done()
	return m, err
}

// loadModel reads a model file and its frozen text pipeline.
func loadModel(path string) (*topics.Model, *text.Frozen, error) {
	f, err := os.Open(path)
	if err != nil {
		return nil, nil, err
	}
	defer f.Close()
	m, err := topics.Load(bufio.NewReader(f))
	if err != nil {
		return nil, nil, fmt.Errorf("%s: %w", path, err)
	}
	var fr text.Frozen
	if err := json.Unmarshal(m.Pipeline(), &fr); err != nil {
		return nil, nil, fmt.Errorf("%s: text pipeline: %w", path, err)
	}
	if err := fr.Prepare(); err != nil {
		return nil, nil, fmt.Errorf("%s: text pipeline: %w", path, err)
	}
	if len(fr.Vocab) != m.V() {
		return nil, nil, fmt.Errorf("%s: text pipeline has %d terms, model %d", path, len(fr.Vocab), m.V())
	}
	return m, &fr, nil
}

// saveModel writes the model file atomically.
func saveModel(path string, m *topics.Model) error {
	return writeFileAtomic(path, func(w io.Writer) error {
		bw := bufio.NewWriter(w)
		if err := m.Save(bw); err != nil {
			return err
		}
		return bw.Flush()
	})
}

// themeLabel makes a program label from a theme's top display words.
func themeLabel(m *topics.Model, k int) string {
	if n := m.ThemeName(k); n != "" {
		return n
	}
	// Relevance (λ = DefaultLambda) rather than probability alone, so that words common to
	// every theme ("employee" in the OSHA abstracts) do not open every label.
	ws := m.TopWords(k, 3, topics.DefaultLambda)
	parts := make([]string, len(ws))
	for i, w := range ws {
		parts[i] = strings.ReplaceAll(w.Display, "_", " ")
	}
	return strings.Join(parts, " · ")
}
