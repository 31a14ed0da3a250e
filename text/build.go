package text

import (
	"context"
	"fmt"
	"io"
	"slices"
	"sort"
	"strings"
	"sync/atomic"
	"undercurrent/text/lexicon"
	"unicode"
	"unicode/utf8"

	"undercurrent/text/phrase"
	"undercurrent/text/repair"
	"undercurrent/text/routine"
	"undercurrent/text/sparse"
	"undercurrent/text/weight"
)

// RoutineReason says why a narrative was set aside as routine.
type RoutineReason uint8

const (
	NotRoutine   RoutineReason = iota
	ShortContent               // no content tokens, or at most Routine.MaxContent
	RoutineWords               // every content token is a routine word
	Duplicate                  // one of Routine.MinGroup or more exact or near duplicates
)

var routineNames = [...]string{"", "short", "routine-words", "duplicate"}

func (r RoutineReason) String() string {
	if int(r) < len(routineNames) {
		return routineNames[r]
	}
	return fmt.Sprintf("RoutineReason(%d)", r)
}

// MarshalText writes the reason's name ("" for NotRoutine).
func (r RoutineReason) MarshalText() ([]byte, error) { return []byte(r.String()), nil }

// UnmarshalText reads a reason's name.
func (r *RoutineReason) UnmarshalText(b []byte) error {
	for i, n := range routineNames {
		if n == string(b) {
			*r = RoutineReason(i)
			return nil
		}
	}
	return fmt.Errorf("text: unknown routine reason %q", b)
}

// Expansion counts one abbreviation's expansions in a corpus.
type Expansion struct {
	Abbrev    string `json:"abbrev"`
	Expansion string `json:"expansion"`
	Count     int    `json:"count"`
}

// PhraseInfo describes a collocation that became a single token.
type PhraseInfo struct {
	Term    string  `json:"term"`    // vocabulary key: the two stems joined by '_'
	Display string  `json:"display"` // the two display forms joined by '_' ("traffic_stop")
	Count   int     `json:"count"`   // adjacent occurrences before merging
	Score   float64 `json:"score"`   // Dunning's G² (package phrase)
}

// Corpus is the result of Build: the document-term counts and everything needed to explain
// them. Narrative tokens are not kept (a million narratives would not fit); Frozen.Transform
// recomputes any narrative's tokens, terms and spans on demand, identically.
type Corpus struct {
	Settings Settings
	// Counts is the document-term count matrix: one row per narrative in input order, one
	// column per vocabulary term. Routine narratives keep their rows.
	Counts  *sparse.Matrix
	Vocab   []string // term keys (stems, or stem_stem phrases), ascending byte order
	Display []string // the display form of each term: its most frequent surface form
	DocFreq []int    // narratives holding each term
	// Routine gives, per narrative, why it is set aside (NotRoutine for the others).
	Routine []RoutineReason
	// DupGroup gives, per narrative, the index of the first narrative of its duplicate group
	// (a narrative that is its own group representative has DupGroup[i] == i), or -1.
	DupGroup []int
	// Audit lists every repair (OCR corrections and rejoined split words) with its count.
	Audit []repair.Correction
	// Expansions counts every abbreviation expanded.
	Expansions []Expansion
	Phrases    []PhraseInfo
	// Common lists the terms found in at least a quarter of the narratives before pruning
	// (most frequent first, ties by term), for suggesting stopwords: SuggestStopwords.
	Common []TermStat
	// Sentences accounts for the boilerplate sentences set aside (nil when
	// Settings.Sentences is off).
	Sentences *SentenceReport `json:",omitempty"`
	Docs      int             // narratives
	Bytes     int             // total raw bytes
	Tokens    int             // tokens scanned (before policies, stopwords, pruning)
	Terms     int             // content term occurrences (after stopwords, before pruning)
}

// TermStat is a term with its display form and document frequency.
type TermStat struct {
	Term    string `json:"term"`
	Display string `json:"display"`
	Docs    int    `json:"docs"`
}

// SuggestStopwords returns the display forms of the terms found in more than share of the
// narratives (share at least 0.25, the least Build records), most frequent first. Inspecting
// them is common practice before fitting themes: boilerplate that no list holds shows up here.
func (c *Corpus) SuggestStopwords(share float64) []string {
	var out []string
	for _, t := range c.Common {
		if float64(t.Docs) > share*float64(c.Docs) {
			out = append(out, t.Display)
		}
	}
	return out
}

// Weights returns the TF-IDF weights of the counts under the corpus's Settings.Weight, and
// the idf vector (package weight).
func (c *Corpus) Weights() (*sparse.Matrix, []float64) {
	return weight.TFIDF(c.Counts, c.Settings.Weight)
}

type surface struct {
	text  string
	kind  Kind
	count int
}

type lexEntry struct {
	stem      int32
	word      string
	protected bool
}

func lettersOnly(s string, ocrDigits bool) bool {
	letter := false
	for _, r := range s {
		switch {
		case unicode.IsLetter(r):
			letter = true
		case ocrDigits && (r == '0' || r == '1' || r == '5'):
		default:
			return false
		}
	}
	return letter
}

// maxRepairLen: longer words (code blobs, glued text) are never repaired; the edit distance
// is quadratic in the length.
const maxRepairLen = 40

// Build runs the whole pipeline over a corpus: tokenize (Analyze's rules), rejoin split words
// and repair OCR noise (corpus frequencies), expand abbreviations, remove stopwords, stem,
// find phrases, prune the vocabulary, count, and set routine narratives aside. It returns the
// corpus and the Frozen pipeline that repeats the same processing on new narratives. It
// returns an error for unusable settings or when ctx is cancelled.
//
// Order of the steps, per token: policy for numbers/times/dates/codes → split-word join →
// OCR repair → abbreviation expansion → stopwords and minimum length → stem. Phrases join two
// adjacent content terms with nothing removed between them and no punctuation break.
func Build(ctx context.Context, docs []string, s Settings) (*Corpus, *Frozen, error) {
	if err := s.Validate(); err != nil {
		return nil, nil, err
	}
	lx, err := newLexer(&s)
	if err != nil {
		return nil, nil, err
	}
	c := &Corpus{Settings: s, Docs: len(docs)}

	// Pass 1: tokenize, intern surfaces, count. Chunks of narratives are scanned in parallel
	// with chunk-local surface tables, then merged in chunk order, so surface ids are numbered
	// by first occurrence exactly as a sequential scan would number them.
	nbytes := 0
	for _, raw := range docs {
		nbytes += len(raw)
	}
	intern := newInternTable(min(nbytes/100, 1<<20) + 64) // all surfaces, ids in surfs order
	var surfs []surface
	c.Bytes = nbytes
	stream := make([]int32, 0, nbytes/5+16)
	docOff := make([]int, len(docs)+1)
	type chunk struct {
		intern *internTable
		surfs  []surface
		stream []int32
		off    []int
		tokens int
		remap  []int32
	}
	const chunkDocs = 2048
	nChunks := (len(docs) + chunkDocs - 1) / chunkDocs
	scanners := make([]onOwnLines[scanner], workers())
	wave := 4 * workers()
	chunks := make([]chunk, wave)
	for w0 := 0; w0 < nChunks; w0 += wave {
		if err := ctx.Err(); err != nil {
			return nil, nil, err
		}
		nw := min(wave, nChunks-w0)
		parallelFor(nw, func(worker, k int) {
			ch := &chunks[k]
			sc := &scanners[worker].v
			lo := (w0 + k) * chunkDocs
			hi := min(lo+chunkDocs, len(docs))
			// Sized once from the chunk's bytes (about one token per 5 bytes, one new
			// surface per 60), so that the appends below seldom grow.
			cb := 0
			for _, raw := range docs[lo:hi] {
				cb += len(raw)
			}
			if ch.intern == nil {
				ch.intern = newInternTable(max(4096, cb/60))
			} else {
				ch.intern.reset()
			}
			ch.surfs = slices.Grow(ch.surfs[:0], cb/60+64)
			ch.stream = slices.Grow(ch.stream[:0], cb/4+64)
			ch.off = append(slices.Grow(ch.off[:0], hi-lo+1), 0)
			ch.tokens = 0
			// The scanner interns as it scans (fused mode), into the chunk's tables.
			sc.in, sc.surfs, sc.ids = ch.intern, ch.surfs, ch.stream
			for _, raw := range docs[lo:hi] {
				sc.scan(raw, s.Tokens.KeepPossessive)
				ch.tokens += sc.ntok
				ch.off = append(ch.off, len(sc.ids))
			}
			ch.surfs, ch.stream = sc.surfs, sc.ids
			sc.in, sc.surfs, sc.ids = nil, nil, nil
		})
		// Surface ids in chunk order (serial: first occurrence numbers them), then the
		// chunks' streams remapped and copied in parallel to their places.
		bases := make([]int, nw)
		for k := 0; k < nw; k++ {
			ch := &chunks[k]
			ch.remap = ch.remap[:0]
			for _, sf := range ch.surfs {
				id := intern.idString(sf.text)
				if int(id) == len(surfs) {
					surfs = append(surfs, surface{sf.text, sf.kind, 0})
				}
				surfs[id].count += sf.count
				ch.remap = append(ch.remap, id)
			}
			bases[k] = len(stream)
			stream = slices.Grow(stream, len(ch.stream))[:len(stream)+len(ch.stream)]
			c.Tokens += ch.tokens
		}
		parallelFor(nw, func(_, k int) {
			ch := &chunks[k]
			dst, base, remap := stream[bases[k]:bases[k]+len(ch.stream)], bases[k], ch.remap
			for i, v := range ch.stream {
				if v >= 0 {
					v = remap[v]
				}
				dst[i] = v
			}
			lo := (w0 + k) * chunkDocs
			for j := 1; j < len(ch.off); j++ {
				docOff[lo+j] = base + ch.off[j]
			}
		})
	}
	chunks = nil

	// Stems of every scanned word, in parallel: stems[id] for the surfaces of kind Word (the
	// repair step and the lexers read them by id; the lexer's cache keeps only other words).
	var stems []string
	if !s.Stem.Off {
		stems = make([]string, len(surfs))
		const per = 512
		parallelFor((len(surfs)+per-1)/per, func(_, k int) {
			for id := k * per; id < min((k+1)*per, len(surfs)); id++ {
				if surfs[id].kind == Word {
					stems[id] = StemWord(surfs[id].text)
				}
			}
		})
	}
	addSurface := func(w string) int32 {
		id := intern.idString(w)
		if int(id) == len(surfs) {
			surfs = append(surfs, surface{w, Word, 0})
		}
		return id
	}

	// Repair tables.
	rs := s.Repair
	fmin, rmax := orInt(rs.FrequentMin, 10), orInt(rs.RareMax, 2)
	nScanned := len(surfs)
	repairTo := make([]int32, nScanned)
	repairCost := make([]float64, nScanned)
	for i := range repairTo {
		repairTo[i] = -1
	}
	if rs.Enabled {
		user := make(map[string]bool)
		var targets []string
		for id := 0; id < nScanned; id++ {
			if sf := surfs[id]; sf.kind == Word && sf.count >= fmin && len(sf.text) <= 4*maxRepairLen && lettersOnly(sf.text, false) {
				targets = append(targets, sf.text)
			}
		}
		for _, w := range rs.Words {
			w = strings.ToLower(strings.TrimSpace(w))
			if w != "" {
				user[w] = true
				targets = append(targets, w)
			}
		}
		minLen, shortLen := orInt(rs.MinLength, 4), orInt(rs.ShortLen, 8)
		ratio := rs.RareRatio
		if ratio == 0 {
			ratio = 50
		}
		maxCost, shortCost := min(orFloat(rs.MaxCost, 1), 1), min(orFloat(rs.ShortMaxCost, 0.5), 1)
		ix := repair.NewIndexLimit(targets, max(maxCost, shortCost))
		var cand []int32
		for id := 0; id < nScanned; id++ {
			sf := surfs[id]
			if sf.kind != Word || sf.count >= fmin || (sf.count > rmax && ratio < 0) {
				continue
			}
			// The cheap tests first (all are pure: the order does not change the result).
			if n := utf8.RuneCountInString(sf.text); n < minLen || n > maxRepairLen || !lettersOnly(sf.text, true) {
				continue
			}
			if user[sf.text] || lx.stop.Has(sf.text) || (rs.KeepKnown && lexicon.Has(sf.text)) {
				continue
			}
			if _, ok := lx.abbrev.Lookup(sf.text); ok {
				continue
			}
			cand = append(cand, int32(id))
		}
		found := make([]string, len(cand))
		costs := make([]float64, len(cand))
		parallelFor(len(cand), func(_, k int) {
			w := surfs[cand[k]].text
			limit := maxCost
			if utf8.RuneCountInString(w) <= shortLen {
				limit = shortCost
			}
			if tgt, cost, ok := ix.Best(w, limit); ok {
				found[k], costs[k] = tgt, cost
			}
		})
		// A word with an inflection of its own in the corpus ("clump" beside "clumped") is
		// taken for a real word: OCR seldom makes the same wrong word twice in two forms. An
		// inflection that is itself repaired to the same family does not count.
		// Families are gathered only for the stems of candidates that found a target.
		family := make(map[string][]int)
		if !s.Stem.Off && !rs.Families {
			for k, id := range cand {
				if found[k] != "" {
					family[stems[id]] = nil
				}
			}
		}
		if len(family) > 0 {
			for id := 0; id < nScanned; id++ {
				if sf := surfs[id]; sf.kind == Word {
					if l, ok := family[stems[id]]; ok && lettersOnly(sf.text, true) {
						family[stems[id]] = append(l, id)
					}
				}
			}
		}
		candTarget := make(map[int]string, len(cand))
		for k, id := range cand {
			if found[k] != "" {
				candTarget[int(id)] = lx.stems.stem(found[k])
			}
		}
		for k, id := range cand {
			tgt := found[k]
			if tgt == "" {
				continue
			}
			if !rs.Families && !s.Stem.Off {
				real := false
				tstem := candTarget[int(id)]
				for _, sib := range family[stems[id]] {
					if sib != int(id) && candTarget[sib] != tstem {
						real = true
						break
					}
				}
				if real {
					continue
				}
			}
			if n := surfs[id].count; n > rmax {
				if tid := intern.findString(tgt); tid < 0 || float64(surfs[tid].count) < ratio*float64(n) {
					continue // not rare enough beside its target
				}
			}
			if !s.Stem.Off && lx.stems.stem(tgt) == stems[id] {
				continue // an inflection of the target: stemming already merges them
			}
			repairTo[id] = addSurface(tgt)
			repairCost[id] = costs[k]
		}
	}
	joinOn := rs.Enabled && !rs.NoJoin
	// A join a+b needs a frequent word that starts with a and ends with b: mark the surfaces
	// that are such prefixes and suffixes, so that most pairs are rejected without a lookup.
	var joinPrefix, joinSuffix []bool
	if joinOn {
		joinPrefix, joinSuffix = make([]bool, nScanned), make([]bool, nScanned)
		for id := 0; id < nScanned; id++ {
			sf := surfs[id]
			if sf.kind != Word || sf.count < fmin || len(sf.text) > 2*maxRepairLen || !lettersOnly(sf.text, false) {
				continue
			}
			for k := 1; k < len(sf.text); k++ {
				if pid := intern.findString(sf.text[:k]); pid >= 0 && int(pid) < nScanned {
					joinPrefix[pid] = true
				}
				if sid := intern.findString(sf.text[k:]); sid >= 0 && int(sid) < nScanned {
					joinSuffix[sid] = true
				}
			}
		}
	}
	// joinable returns the surface id of a+b when the split-word rule joins them, else -1. It
	// only reads shared tables; cache and buf belong to the caller's goroutine.
	joinable := func(a, b int32, cache map[[2]int32]int32, buf *[]byte) int32 {
		if a >= int32(nScanned) || b >= int32(nScanned) || !joinPrefix[a] || !joinSuffix[b] {
			return -1
		}
		sa, sb := &surfs[a], &surfs[b]
		if sa.kind != Word || sb.kind != Word || sa.count >= fmin || sb.count >= fmin {
			return -1
		}
		k := [2]int32{a, b}
		if j, ok := cache[k]; ok {
			return j
		}
		j := int32(-1)
		if lettersOnly(sa.text, false) && lettersOnly(sb.text, false) {
			*buf = append(append((*buf)[:0], sa.text...), sb.text...)
			if id := intern.find(*buf); id >= 0 && int(id) < nScanned && surfs[id].count >= fmin && surfs[id].kind == Word {
				j = id
			}
		}
		cache[k] = j
		return j
	}

	// The sentence step (Settings.Sentences): boilerplate sentences and repeats found on the
	// text as scanned; pass 2 leaves their tokens out.
	var bp *boilerplate
	if s.Sentences.Enabled {
		if bp, err = findBoilerplate(ctx, docs, &s); err != nil {
			return nil, nil, err
		}
		c.Sentences = bp.report
	}

	// Pass 2: join, repair, lex → stem stream.
	stemID := make(map[string]int32, len(surfs)/2+64)
	var stemStr []string
	var stemProt []bool
	internStem := func(st string, prot bool) int32 {
		if id, ok := stemID[st]; ok {
			return id
		}
		id := int32(len(stemStr))
		stemID[st] = id
		stemStr = append(stemStr, st)
		stemProt = append(stemProt, prot)
		return id
	}
	// Per-surface results of the token steps (policy, abbreviations, stopwords, stems),
	// computed in parallel with forked lexers, then given stem ids in surface order.
	lexWords := make([][]lexWord, len(surfs))
	lexExp := make([]bool, len(surfs))
	{
		forks := make([]*lexer, workers())
		for w := range forks {
			forks[w] = lx.fork()
		}
		const per = 512
		parallelFor((len(surfs)+per-1)/per, func(w, k int) {
			var flat []lexWord // one array per block of surfaces
			hi := min((k+1)*per, len(surfs))
			ends := make([]int, 0, per)
			for id := k * per; id < hi; id++ {
				hint := ""
				if id < len(stems) && surfs[id].kind == Word {
					hint = stems[id]
				}
				words, exp := forks[w].lexHint(surfs[id].text, surfs[id].kind, hint)
				flat = append(flat, words...)
				ends = append(ends, len(flat))
				lexExp[id] = exp
			}
			lo := 0
			for k2, e := range ends {
				if e > lo {
					lexWords[k*per+k2] = flat[lo:e:e]
				}
				lo = e
			}
		})
		for _, f := range forks {
			for k, v := range f.stems.own {
				lx.stems.own[k] = v // stems of expansion words, for later lookups
			}
		}
	}
	// lexCache[id] holds the entries of surface id (one backing array for all); info[id] packs
	// what the pass-2 loop reads per token (repair target, join flags, the stem ids' place in
	// lexStems), so that a token costs one cache line there instead of several.
	type p2info struct {
		repair, lo, hi int32
		jp, js         bool
	}
	nLex := 0
	for _, words := range lexWords {
		nLex += len(words)
	}
	lexCache := make([][]lexEntry, len(surfs))
	lexBack := make([]lexEntry, 0, nLex)
	lexStems := make([]int32, 0, nLex)
	info := make([]p2info, len(surfs))
	for id, words := range lexWords {
		inf := &info[id]
		inf.repair, inf.lo = -1, int32(len(lexStems))
		if id < nScanned {
			inf.repair = repairTo[id]
			if joinOn {
				inf.jp, inf.js = joinPrefix[id], joinSuffix[id]
			}
		}
		if len(words) > 0 {
			lo := len(lexBack)
			for _, w := range words {
				st := internStem(w.stem, w.protected)
				lexBack = append(lexBack, lexEntry{st, w.word, w.protected})
				lexStems = append(lexStems, st)
			}
			lexCache[id] = lexBack[lo:len(lexBack):len(lexBack)]
		}
		inf.hi = int32(len(lexStems))
	}
	lexWords = nil
	// Pass 2 over blocks of narratives in parallel, each block writing its own stem stream and
	// each worker its own counters; blocks are then joined in order and counters summed.
	type p2worker struct {
		occ, repairCount []int
		joinCount        map[[2]int32]int
		joinCache        map[[2]int32]int32
		buf              []byte
	}
	p2 := make([]onOwnLines[p2worker], workers())
	for w := range p2 {
		p2[w].v = p2worker{make([]int, len(surfs)), make([]int, nScanned), make(map[[2]int32]int), make(map[[2]int32]int32), nil}
	}
	const p2per = 2048
	type p2block struct {
		out []int32
		off []int // per narrative end offsets within out
	}
	p2blocks := make([]p2block, (len(docs)+p2per-1)/p2per)
	var cancelled atomic.Bool
	parallelFor(len(p2blocks), func(w, blk int) {
		if ctx.Err() != nil {
			cancelled.Store(true)
			return
		}
		st := &p2[w].v
		lo, hi := blk*p2per, min((blk+1)*p2per, len(docs))
		out := make([]int32, 0, docOff[hi]-docOff[lo])
		off := make([]int, 0, hi-lo)
		for d := lo; d < hi; d++ {
			ss := stream[docOff[d]:docOff[d+1]]
			start := len(out)
			// drops are the narrative's set-aside sentences (token ranges, ascending); ti is
			// the index of token ss[i] among the narrative's tokens.
			var drops []sentRec
			if bp != nil {
				drops = bp.doc(d)
			}
			ti, di := -1, 0
			for i := 0; i < len(ss); i++ {
				id := ss[i]
				if id < 0 {
					if len(out) > start && out[len(out)-1] != -1 {
						out = append(out, -1)
					}
					continue
				}
				ti++
				dropNext := false
				if len(drops) > 0 {
					for di < len(drops) && int(drops[di].hi) <= ti {
						di++
					}
					if di < len(drops) && int(drops[di].lo) <= ti {
						// Set aside: a break stands in its place.
						if len(out) > start && out[len(out)-1] != -1 {
							out = append(out, -1)
						}
						continue
					}
					dropNext = di < len(drops) && int(drops[di].lo) == ti+1
				}
				inf := &info[id]
				joined := false
				if inf.jp && i+1 < len(ss) && ss[i+1] >= 0 && info[ss[i+1]].js && !dropNext {
					if j := joinable(id, ss[i+1], st.joinCache, &st.buf); j >= 0 {
						st.joinCount[[2]int32{id, ss[i+1]}]++
						id, joined = j, true
						inf = &info[id]
						i++
						ti++
					}
				}
				if !joined && inf.repair >= 0 {
					st.repairCount[id]++
					id = inf.repair
					inf = &info[id]
				}
				st.occ[id]++
				if inf.lo == inf.hi {
					if len(out) > start && out[len(out)-1] != -1 {
						out = append(out, -1)
					}
					continue
				}
				if inf.hi == inf.lo+1 {
					out = append(out, lexStems[inf.lo])
				} else {
					out = append(out, lexStems[inf.lo:inf.hi]...)
				}
			}
			if len(out) > start && out[len(out)-1] == -1 {
				out = out[:len(out)-1]
			}
			off = append(off, len(out))
		}
		p2blocks[blk] = p2block{out, off}
	})
	if cancelled.Load() {
		return nil, nil, ctx.Err()
	}
	stream, docOff = nil, nil // the surface stream is no longer needed: let it go before joining
	total2 := 0
	for _, b := range p2blocks {
		total2 += len(b.out)
	}
	out := make([]int32, 0, total2)
	docOff2 := make([]int, len(docs)+1)
	for blk, b := range p2blocks {
		base := len(out)
		out = append(out, b.out...)
		for k, e := range b.off {
			docOff2[blk*p2per+k+1] = base + e
		}
		p2blocks[blk] = p2block{}
	}
	occ, repairCount := p2[0].v.occ, p2[0].v.repairCount
	joinCount, joinCache := p2[0].v.joinCount, p2[0].v.joinCache
	for i := range p2[1:] {
		st := &p2[1+i].v
		for i, v := range st.occ {
			occ[i] += v
		}
		for i, v := range st.repairCount {
			repairCount[i] += v
		}
		for k, v := range st.joinCount {
			joinCount[k] += v
		}
		for k, v := range st.joinCache {
			joinCache[k] = v
		}
	}
	p2 = nil

	// Display forms of stems: the most frequent word, ties to the smaller (byte order).
	// Counted per (stem, word id) in a countTable; the choice below does not depend on the
	// order the table is read in.
	dispWords := newInternTable(len(surfs))
	dispCount := newCountTable(len(stemStr))
	for id := range surfs {
		if occ[id] == 0 {
			continue
		}
		for _, e := range lexCache[id] {
			w := dispWords.idString(e.word)
			dispCount.add(uint64(uint32(e.stem))<<32|uint64(uint32(w)), occ[id])
		}
		if lexExp[id] {
			e, _ := lx.abbrev.Lookup(surfs[id].text)
			c.Expansions = append(c.Expansions, Expansion{surfs[id].text, strings.Join(e, " "), occ[id]})
		}
	}
	sort.Slice(c.Expansions, func(i, j int) bool { return c.Expansions[i].Abbrev < c.Expansions[j].Abbrev })
	disp := make([]string, len(stemStr))
	best := make([]int, len(stemStr))
	dispCount.each(func(k uint64, n int) {
		st, w := int32(k>>32), dispWords.strs[uint32(k)]
		if n > best[st] || (n == best[st] && w < disp[st]) {
			best[st], disp[st] = n, w
		}
	})
	dispWords, dispCount = nil, nil

	// Phrases.
	var phrasePairs [][2]string
	var phraseParts [][3]int32 // phrase id, first, second
	if s.Phrases.Enabled {
		// A pair cannot occur more often than its rarer word: pairs with a word seen fewer
		// than MinCount times are counted in the margins only.
		minCount := orInt(s.Phrases.MinCount, 5)
		occur := make([]int, len(stemStr))
		for _, t := range out {
			if t >= 0 {
				occur[t]++
			}
		}
		// Counted per worker over blocks of narratives, then summed (sums do not depend on
		// the split).
		type pairStats struct {
			count       *countTable
			left, right []int
			n           int
		}
		ps := make([]onOwnLines[pairStats], workers())
		for w := range ps {
			ps[w].v = pairStats{newCountTable(len(stemStr)), make([]int, len(stemStr)), make([]int, len(stemStr)), 0}
		}
		const per = 2048
		parallelFor((len(docs)+per-1)/per, func(w, blk int) {
			st := &ps[w].v
			for d := blk * per; d < min((blk+1)*per, len(docs)); d++ {
				for k := docOff2[d]; k+1 < docOff2[d+1]; k++ {
					a, b := out[k], out[k+1]
					if a < 0 || b < 0 || stemProt[a] || stemProt[b] {
						continue
					}
					if occur[a] >= minCount && occur[b] >= minCount {
						st.count.add(uint64(a)<<32|uint64(b), 1)
					}
					st.left[a]++
					st.right[b]++
					st.n++
				}
			}
		})
		left, right, n := ps[0].v.left, ps[0].v.right, ps[0].v.n
		pairCount := ps[0].v.count
		for i := range ps[1:] {
			st := &ps[1+i].v
			for i := range left {
				left[i] += st.left[i]
				right[i] += st.right[i]
			}
			n += st.n
			st.count.each(pairCount.add)
		}
		ps = nil
		pc := make(map[[2]int32]int, pairCount.n/4)
		pairCount.each(func(k uint64, v int) {
			if v >= minCount {
				pc[[2]int32{int32(k >> 32), int32(uint32(k))}] = v
			}
		})
		pairCount = nil
		sel := phrase.Select(pc, left, right, n, s.Phrases.Settings)
		phraseID := make(map[uint64]int32, len(sel))
		isLeft, isRight := make([]bool, len(stemStr)), make([]bool, len(stemStr))
		for _, p := range sel {
			key := stemStr[p.A] + "_" + stemStr[p.B]
			id := internStem(key, false)
			for len(disp) < len(stemStr) {
				disp = append(disp, "")
			}
			disp[id] = disp[p.A] + "_" + disp[p.B]
			phraseID[uint64(p.A)<<32|uint64(p.B)] = id
			phraseParts = append(phraseParts, [3]int32{id, p.A, p.B})
			isLeft[p.A], isRight[p.B] = true, true
			phrasePairs = append(phrasePairs, [2]string{stemStr[p.A], stemStr[p.B]})
			c.Phrases = append(c.Phrases, PhraseInfo{key, disp[id], p.Count, p.Score})
		}
		if len(phraseID) > 0 {
			// Merge within each narrative's own segment in parallel, then close the gaps.
			ends := make([]int, len(docs))
			parallelFor((len(docs)+per-1)/per, func(_, blk int) {
				for d := blk * per; d < min((blk+1)*per, len(docs)); d++ {
					a, b := docOff2[d], docOff2[d+1]
					w := a
					for k := a; k < b; {
						if k+1 < b && out[k] >= 0 && out[k+1] >= 0 && isLeft[out[k]] && isRight[out[k+1]] {
							if p, ok := phraseID[uint64(out[k])<<32|uint64(out[k+1])]; ok {
								out[w] = p
								w++
								k += 2
								continue
							}
						}
						out[w] = out[k]
						w++
						k++
					}
					ends[d] = w
				}
			})
			w := 0
			for d := range docs {
				a := docOff2[d]
				docOff2[d] = w
				w += copy(out[w:], out[a:ends[d]])
			}
			docOff2[len(docs)] = w
			out = out[:w]
		}
	}

	// Term statistics and routine narratives.
	nTerms := len(stemStr)
	routineStem := make([]bool, nTerms)
	for _, w := range s.Routine.Words {
		w = strings.ToLower(strings.TrimSpace(w))
		if w == "" {
			continue
		}
		st := w
		if !s.Stem.Off {
			st = lx.stems.stem(w)
		}
		if id, ok := stemID[st]; ok {
			routineStem[id] = true
		}
	}
	for _, p := range phraseParts {
		routineStem[p[0]] = routineStem[p[1]] && routineStem[p[2]]
	}
	c.Routine = make([]RoutineReason, len(docs))
	c.DupGroup = make([]int, len(docs))
	// Per worker over blocks of narratives (each narrative within one block), then summed:
	// the counts are integers, so the float sums are exact whatever the split.
	type termStats struct {
		df    []int
		total []float64
		last  []int
		terms int
	}
	tsw := make([]onOwnLines[termStats], workers())
	{
		const per = 2048
		parallelFor((len(docs)+per-1)/per, func(w, blk int) {
			st := &tsw[w].v
			if st.df == nil {
				st.df, st.total, st.last = make([]int, nTerms), make([]float64, nTerms), make([]int, nTerms)
				for i := range st.last {
					st.last[i] = -1
				}
			}
			df, total, last := st.df, st.total, st.last
			for d := blk * per; d < min((blk+1)*per, len(docs)); d++ {
				content, allRoutine := 0, len(s.Routine.Words) > 0
				for _, t := range out[docOff2[d]:docOff2[d+1]] {
					if t < 0 {
						continue
					}
					content++
					total[t]++
					if last[t] != d {
						last[t] = d
						df[t]++
					}
					if !routineStem[t] {
						allRoutine = false
					}
				}
				st.terms += content
				c.DupGroup[d] = -1
				switch {
				case content == 0 || content <= s.Routine.MaxContent:
					c.Routine[d] = ShortContent
				case allRoutine && content > 0:
					c.Routine[d] = RoutineWords
				}
			}
		})
	}
	df, total := make([]int, nTerms), make([]float64, nTerms)
	for i := range tsw {
		st := &tsw[i].v
		if st.df == nil {
			continue
		}
		for t := range df {
			df[t] += st.df[t]
			total[t] += st.total[t]
		}
		c.Terms += st.terms
	}
	tsw = nil
	if s.Routine.NearDup {
		h := routine.NewHasher(s.Routine.Settings)
		th := make([]uint64, nTerms)
		for i, st := range stemStr {
			th[i] = routine.HashString(st)
		}
		sigs := make([][]uint64, len(docs))
		nh := h.Len()
		flat := make([]uint64, nh*len(docs)) // one backing array: no allocation per narrative
		bufs := make([][]uint64, workers())
		minDup := orInt(s.Routine.MinDupContent, 8)
		short := make([]bool, len(docs))
		const per = 256
		parallelFor((len(docs)+per-1)/per, func(w, k int) {
			for d := k * per; d < min((k+1)*per, len(docs)); d++ {
				buf := bufs[w][:0]
				for _, t := range out[docOff2[d]:docOff2[d+1]] {
					if t >= 0 {
						buf = append(buf, th[t])
					}
				}
				sigs[d] = h.Signature(flat[d*nh:d*nh:(d+1)*nh], buf)
				short[d] = len(buf) < minDup
				bufs[w] = buf
			}
		})
		g := h.GroupsParallel(sigs, func(n int, f func(int)) { parallelFor(n, func(_, b int) { f(b) }) })
		size := make([]int, len(docs))
		for _, r := range g {
			size[r]++
		}
		minGroup, minShort := orInt(s.Routine.MinGroup, 3), orInt(s.Routine.MinShortGroup, 10)
		for d, r := range g {
			need := minGroup
			if short[d] {
				need = max(minGroup, minShort)
			}
			if size[r] >= need {
				c.DupGroup[d] = r
				if c.Routine[d] == NotRoutine {
					c.Routine[d] = Duplicate
				}
			}
		}
	}

	for t, n := range df {
		if 4*n >= len(docs) && n > 0 {
			d := disp[t]
			if d == "" {
				d = stemStr[t]
			}
			c.Common = append(c.Common, TermStat{stemStr[t], d, n})
		}
	}
	sort.Slice(c.Common, func(i, j int) bool {
		if c.Common[i].Docs != c.Common[j].Docs {
			return c.Common[i].Docs > c.Common[j].Docs
		}
		return c.Common[i].Term < c.Common[j].Term
	})

	// Vocabulary and counts.
	keep := weight.Prune(stemStr, df, total, len(docs), s.Vocab)
	newID := make([]int32, nTerms)
	for i := range newID {
		newID[i] = -1
	}
	c.Vocab = make([]string, len(keep))
	c.Display = make([]string, len(keep))
	c.DocFreq = make([]int, len(keep))
	for j, t := range keep {
		newID[t] = int32(j)
		c.Vocab[j] = stemStr[t]
		c.Display[j] = disp[t]
		if c.Display[j] == "" {
			c.Display[j] = stemStr[t]
		}
		c.DocFreq[j] = df[t]
	}
	// Rows are built in blocks in parallel and stacked in order.
	const rowsPer = 4096
	blocks := make([]*sparse.Matrix, (len(docs)+rowsPer-1)/rowsPer)
	// Each row counts its terms in a dense per-worker array and sorts only its distinct ones.
	rowCounts := make([][]int32, workers())
	parallelFor(len(blocks), func(w, blk int) {
		lo, hi := blk*rowsPer, min((blk+1)*rowsPer, len(docs))
		b := sparse.NewBuilder(len(keep))
		b.Grow(hi-lo, (docOff2[hi]-docOff2[lo])/2)
		if rowCounts[w] == nil {
			rowCounts[w] = make([]int32, len(keep))
		}
		cnt := rowCounts[w]
		var ids []int32
		for d := lo; d < hi; d++ {
			ids = ids[:0]
			for _, t := range out[docOff2[d]:docOff2[d+1]] {
				if t < 0 {
					continue
				}
				if j := newID[t]; j >= 0 {
					if cnt[j] == 0 {
						ids = append(ids, j)
					}
					cnt[j]++
				}
			}
			slices.Sort(ids)
			b.AddSortedCounts(ids, cnt)
		}
		blocks[blk] = b.Matrix()
	})
	c.Counts = sparse.Stack(blocks...)
	c.Counts.Cols = len(keep)
	blocks = nil

	// Audit.
	for id := 0; id < nScanned; id++ {
		if repairCount[id] > 0 {
			c.Audit = append(c.Audit, repair.Correction{From: surfs[id].text, To: surfs[repairTo[id]].text, Kind: "ocr", Cost: repairCost[id], Count: repairCount[id]})
		}
	}
	f := &Frozen{
		Settings: s,
		Vocab:    c.Vocab,
		Display:  c.Display,
		DocFreq:  c.DocFreq,
		Docs:     len(docs),
		Phrases:  phrasePairs,
		Repairs:  make(map[string]string),
		Joins:    make(map[string]string),
	}
	if bp != nil {
		f.Sentences = bp.keys
	}
	for k, n := range joinCount {
		from := surfs[k[0]].text + " " + surfs[k[1]].text
		to := surfs[joinCache[k]].text
		c.Audit = append(c.Audit, repair.Correction{From: from, To: to, Kind: "join", Count: n})
		f.Joins[from] = to
	}
	repair.SortCorrections(c.Audit)
	for id := 0; id < nScanned; id++ {
		if repairTo[id] >= 0 {
			f.Repairs[surfs[id].text] = surfs[repairTo[id]].text
		}
	}
	if err := f.Prepare(); err != nil {
		return nil, nil, err
	}
	return c, f, nil
}

// WriteAudit writes the repair audit as CSV (repair.WriteCSV).
func (c *Corpus) WriteAudit(w io.Writer) error { return repair.WriteCSV(w, c.Audit) }
