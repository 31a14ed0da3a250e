package text

import (
	"context"
	"slices"
	"sort"
	"strings"

	"undercurrent/text/sentences"
)

// SentenceReport accounts for the boilerplate-sentence step (Settings.Sentences) of a Build.
type SentenceReport struct {
	// Threshold is the number of narratives a key needed (SentenceSettings.Threshold).
	Threshold int `json:"threshold"`
	// Keys are the boilerplate keys, most narratives first, ties by key. A key is the
	// sentence's tokens as the tokenizer reads them (lower case, possessive "'s" stripped),
	// numbers, times and dates written "[number]", "[time]", "[date]", joined by spaces; it is
	// made from the text Build was given (redacted, with placeholders blanked, in the command).
	Keys []SentenceKey `json:"keys"`
	// Sentences counts the sentence occurrences set aside, Repeats those of them set aside
	// only as repeats within their narrative, Tokens their tokens.
	Sentences int `json:"sentences"`
	Repeats   int `json:"repeats"`
	Tokens    int `json:"tokens"`
	// Narratives[n] is the number of narratives with n sentences set aside (n = 0, 1, ...,
	// the largest); RepeatNarratives those with at least one repeat set aside.
	Narratives       []int `json:"narratives"`
	RepeatNarratives int   `json:"repeat_narratives"`
}

// SentenceKey is one boilerplate key with the number of narratives holding it and its length
// in tokens.
type SentenceKey struct {
	Key        string `json:"key"`
	Narratives int    `json:"narratives"`
	Tokens     int    `json:"tokens"`
}

// sentRec is one sentence of a narrative: its key's hash and its tokens [lo, hi), indexes into
// the narrative's tokens in scan order.
type sentRec struct {
	hash   uint64
	lo, hi int32
}

// splitter cuts scanned narratives into sentences; one per goroutine, buffers reused.
type splitter struct {
	toks   []sentences.Token
	starts []int
	seen   []uint64
	seenM  map[uint64]bool
}

var kindKey = [...][]byte{Number: []byte("[number]"), Time: []byte("[time]"), Date: []byte("[date]")}

// keyForm is a token's form in a sentence key: numbers, times and dates by kind, others as
// scanned.
func keyForm(sc *scanner, t rawTok) []byte {
	switch t.kind {
	case Number, Time, Date:
		return kindKey[t.kind]
	}
	return sc.text[t.a:t.b]
}

// split appends the sentences of the narrative sc scanned last (plain mode) to dst.
// Boundaries are read in the normalised text (so an encoded or full-width full stop counts);
// its bytes map back to the original through the scanner's byte map.
func (sp *splitter) split(dst []sentRec, sc *scanner) []sentRec {
	x := sc.nb.bytes()
	sp.toks = sp.toks[:0]
	for _, t := range sc.toks {
		sp.toks = append(sp.toks, sentences.Token{Start: int(t.s), End: int(t.e), Lower: sc.text[t.a:t.b]})
	}
	sp.starts = sentences.Starts(sp.starts[:0], x, sp.toks)
	for k, lo := range sp.starts {
		hi := len(sc.toks)
		if k+1 < len(sp.starts) {
			hi = sp.starts[k+1]
		}
		h := sentences.Start
		for _, t := range sc.toks[lo:hi] {
			h = sentences.Add(h, keyForm(sc, t))
		}
		dst = append(dst, sentRec{h, int32(lo), int32(hi)})
	}
	return dst
}

// key returns the key string of the sentence r of the narrative sc scanned last.
func keyString(sc *scanner, r sentRec) string {
	var b strings.Builder
	for i, t := range sc.toks[r.lo:r.hi] {
		if i > 0 {
			b.WriteByte(' ')
		}
		b.Write(keyForm(sc, t))
	}
	return b.String()
}

// repeat reports whether h was seen earlier in the narrative (and records it). reset starts a
// narrative.
func (sp *splitter) repeat(h uint64) bool {
	if sp.seenM != nil {
		if sp.seenM[h] {
			return true
		}
		sp.seenM[h] = true
		return false
	}
	if slices.Contains(sp.seen, h) {
		return true
	}
	sp.seen = append(sp.seen, h)
	if len(sp.seen) > 32 {
		sp.seenM = make(map[uint64]bool, 64)
		for _, v := range sp.seen {
			sp.seenM[v] = true
		}
	}
	return false
}

func (sp *splitter) reset() {
	sp.seen = sp.seen[:0]
	sp.seenM = nil
}

// Why a sentence is set aside.
const (
	sentKept uint8 = iota
	sentBoilerplate
	sentRepeat
)

// judge says, for each sentence of one narrative, whether it is set aside: a boilerplate key
// (isBP), or with repeats a key seen earlier in the narrative; sentences of fewer than
// minTokens tokens never. Build and Frozen.Transform both decide through it.
func (sp *splitter) judge(why []uint8, recs []sentRec, isBP func(uint64) bool, repeats bool, minTokens int) []uint8 {
	why = why[:0]
	sp.reset()
	for _, r := range recs {
		w := sentKept
		if int(r.hi-r.lo) >= minTokens {
			rep := repeats && sp.repeat(r.hash)
			switch {
			case isBP(r.hash):
				w = sentBoilerplate
			case rep:
				w = sentRepeat
			}
		}
		why = append(why, w)
	}
	return why
}

// sentChunk is the number of narratives per block of the sentence step; pass 2 of Build
// uses blocks of the same size (p2per), so a block's drops are found by index.
const sentChunk = 2048

// boilerplate is the outcome of the sentence step over a corpus.
type boilerplate struct {
	drops  [][]sentRec // per block: the set-aside sentences of its narratives, in order
	off    [][]int32   // per block: per narrative the end of its sentences in drops
	keys   []string    // boilerplate keys, ascending (the Frozen's)
	report *SentenceReport
}

// doc returns the set-aside sentences of narrative d (ascending token ranges).
func (b *boilerplate) doc(d int) []sentRec {
	k, j := d/sentChunk, d%sentChunk
	lo := int32(0)
	if j > 0 {
		lo = b.off[k][j-1]
	}
	return b.drops[k][lo:b.off[k][j]]
}

// findBoilerplate runs the sentence step over docs: cut every narrative into sentences, count
// the narratives holding each key (a key counted once per narrative), choose the boilerplate
// keys and mark, per narrative, the sentences set aside. Blocks of narratives are scanned in
// parallel with per-worker count tables, which are summed (sums do not depend on the split or
// the order), so the outcome is the same whatever GOMAXPROCS.
func findBoilerplate(ctx context.Context, docs []string, s *Settings) (*boilerplate, error) {
	ss := s.Sentences
	minTok := ss.minTokens()
	nBlocks := (len(docs) + sentChunk - 1) / sentChunk
	recs := make([][]sentRec, nBlocks)
	recOff := make([][]int32, nBlocks)
	type worker struct {
		sc     scanner
		sp     splitter
		counts *countTable
	}
	ws := make([]worker, workers())
	parallelFor(nBlocks, func(w, k int) {
		if ctx.Err() != nil {
			return
		}
		st := &ws[w]
		if st.counts == nil {
			st.counts = newCountTable(4096)
		}
		lo, hi := k*sentChunk, min((k+1)*sentChunk, len(docs))
		var rs []sentRec
		off := make([]int32, 0, hi-lo)
		for _, raw := range docs[lo:hi] {
			st.sc.scan(raw, s.Tokens.KeepPossessive)
			a := len(rs)
			rs = st.sp.split(rs, &st.sc)
			st.sp.reset()
			for _, r := range rs[a:] {
				if int(r.hi-r.lo) >= minTok && !st.sp.repeat(r.hash) {
					st.counts.add(r.hash, 1)
				}
			}
			off = append(off, int32(len(rs)))
		}
		recs[k], recOff[k] = rs, off
	})
	if err := ctx.Err(); err != nil {
		return nil, err
	}
	var total *countTable
	for i := range ws {
		if ws[i].counts == nil {
			continue
		}
		if total == nil {
			total = ws[i].counts
			continue
		}
		ws[i].counts.each(total.add)
		ws[i].counts = nil
	}
	thr := ss.Threshold(len(docs))
	bpCount := map[uint64]int{}
	if total != nil {
		total.each(func(h uint64, n int) {
			if n >= thr {
				bpCount[h] = n
			}
		})
	}
	isBP := func(h uint64) bool { _, ok := bpCount[h]; return ok }

	// Per block: the sentences set aside and the accounting, summed in block order.
	b := &boilerplate{drops: make([][]sentRec, nBlocks), off: make([][]int32, nBlocks)}
	type tally struct {
		sentences, repeats, tokens, repNarr int
		hist                                []int
	}
	tallies := make([]tally, nBlocks)
	parallelFor(nBlocks, func(w, k int) {
		sp := &ws[w].sp
		var why []uint8
		var drops []sentRec
		off := make([]int32, len(recOff[k]))
		t := &tallies[k]
		a := int32(0)
		for j, e := range recOff[k] {
			rs := recs[k][a:e]
			why = sp.judge(why, rs, isBP, ss.Repeats, minTok)
			n, rep := 0, false
			for i, r := range rs {
				if why[i] == sentKept {
					continue
				}
				drops = append(drops, r)
				n++
				t.tokens += int(r.hi - r.lo)
				if why[i] == sentRepeat {
					t.repeats++
					rep = true
				}
			}
			t.sentences += n
			if rep {
				t.repNarr++
			}
			for len(t.hist) <= n {
				t.hist = append(t.hist, 0)
			}
			t.hist[n]++
			off[j] = int32(len(drops))
			a = e
		}
		b.drops[k], b.off[k] = drops, off
	})
	rep := &SentenceReport{Threshold: thr}
	for _, t := range tallies {
		rep.Sentences += t.sentences
		rep.Repeats += t.repeats
		rep.Tokens += t.tokens
		rep.RepeatNarratives += t.repNarr
		for n, c := range t.hist {
			for len(rep.Narratives) <= n {
				rep.Narratives = append(rep.Narratives, 0)
			}
			rep.Narratives[n] += c
		}
	}
	// Each key's text from its first narrative (in input order).
	named := make(map[uint64]bool, len(bpCount))
	var sc scanner
	for k := 0; k < nBlocks && len(named) < len(bpCount); k++ {
		a := int32(0)
		for j, e := range recOff[k] {
			scanned := false
			for _, r := range recs[k][a:e] {
				if _, ok := bpCount[r.hash]; !ok || named[r.hash] || int(r.hi-r.lo) < minTok {
					continue
				}
				if !scanned {
					sc.scan(docs[k*sentChunk+j], s.Tokens.KeepPossessive)
					scanned = true
				}
				named[r.hash] = true
				key := keyString(&sc, r)
				rep.Keys = append(rep.Keys, SentenceKey{Key: key, Narratives: bpCount[r.hash], Tokens: int(r.hi - r.lo)})
				b.keys = append(b.keys, key)
			}
			a = e
		}
	}
	sort.Slice(rep.Keys, func(i, j int) bool {
		if rep.Keys[i].Narratives != rep.Keys[j].Narratives {
			return rep.Keys[i].Narratives > rep.Keys[j].Narratives
		}
		return rep.Keys[i].Key < rep.Keys[j].Key
	})
	sort.Strings(b.keys)
	b.report = rep
	return b, nil
}
