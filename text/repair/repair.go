package repair

import (
	"encoding/csv"
	"io"
	"sort"
	"strconv"
	"unicode/utf8"
)

func confusable(a, b rune) bool {
	if a > b {
		a, b = b, a
	}
	switch [2]rune{a, b} {
	case [2]rune{'0', 'o'}, [2]rune{'1', 'l'}, [2]rune{'1', 'i'}, [2]rune{'i', 'l'}, [2]rune{'5', 's'}, [2]rune{'c', 'e'}:
		return true
	}
	return false
}

// twoToOne lists the OCR confusions of two characters read as one (and back).
var twoToOne = [][3]rune{{'r', 'n', 'm'}, {'c', 'l', 'd'}, {'v', 'v', 'w'}}

// Distance returns the weighted distance between a and b (see the package comment).
func Distance(a, b string) float64 {
	return distance([]rune(a), []rune(b))
}

func distance(a, b []rune) float64 {
	n, m := len(a), len(b)
	w := m + 1
	d := make([]float64, (n+1)*w) // d[i*w+j]: distance of a[:i] and b[:j]
	for i := 0; i <= n; i++ {
		d[i*w] = float64(i)
	}
	for j := 0; j <= m; j++ {
		d[j] = float64(j)
	}
	for i := 1; i <= n; i++ {
		for j := 1; j <= m; j++ {
			sub := 1.0
			if a[i-1] == b[j-1] {
				sub = 0
			} else if confusable(a[i-1], b[j-1]) {
				sub = 0.5
			}
			v := d[(i-1)*w+j-1] + sub
			if x := d[(i-1)*w+j] + 1; x < v {
				v = x
			}
			if x := d[i*w+j-1] + 1; x < v {
				v = x
			}
			if i > 1 && j > 1 && a[i-1] == b[j-2] && a[i-2] == b[j-1] {
				if x := d[(i-2)*w+j-2] + 1; x < v {
					v = x
				}
			}
			for _, t := range twoToOne {
				if i > 1 && a[i-2] == t[0] && a[i-1] == t[1] && b[j-1] == t[2] {
					if x := d[(i-2)*w+j-1] + 0.5; x < v {
						v = x
					}
				}
				if j > 1 && b[j-2] == t[0] && b[j-1] == t[1] && a[i-1] == t[2] {
					if x := d[(i-1)*w+j-2] + 0.5; x < v {
						v = x
					}
				}
			}
			d[i*w+j] = v
		}
	}
	return d[n*w+m]
}

// Index finds the closest target word of a query word.
type Index struct {
	targets   []string
	runes     [][]rune
	del       map[string][]int32
	canonOnly bool
}

// canonical maps a word to its OCR-canonical form: 0→o, 1→l, i→l, 5→s, e→c, rn→m, cl→d, vv→w.
// Two words that differ only by OCR confusions have the same canonical form.
func canonical(w string) []rune {
	rs := []rune(w)
	out := rs[:0:0]
	for i := 0; i < len(rs); i++ {
		r := rs[i]
		if i+1 < len(rs) {
			pair := [2]rune{r, rs[i+1]}
			switch pair {
			case [2]rune{'r', 'n'}:
				out = append(out, 'm')
				i++
				continue
			case [2]rune{'c', 'l'}:
				out = append(out, 'd')
				i++
				continue
			case [2]rune{'v', 'v'}:
				out = append(out, 'w')
				i++
				continue
			}
		}
		switch r {
		case '0':
			r = 'o'
		case '1', 'i':
			r = 'l'
		case '5':
			r = 's'
		case 'e':
			r = 'c'
		}
		out = append(out, r)
	}
	return out
}

// canonicalASCII is canonical for an ASCII word, on bytes, appended to dst.
func canonicalASCII(dst []byte, w string) []byte {
	for i := 0; i < len(w); i++ {
		c := w[i]
		if i+1 < len(w) {
			switch {
			case c == 'r' && w[i+1] == 'n':
				dst = append(dst, 'm')
				i++
				continue
			case c == 'c' && w[i+1] == 'l':
				dst = append(dst, 'd')
				i++
				continue
			case c == 'v' && w[i+1] == 'v':
				dst = append(dst, 'w')
				i++
				continue
			}
		}
		switch c {
		case '0':
			c = 'o'
		case '1', 'i':
			c = 'l'
		case '5':
			c = 's'
		case 'e':
			c = 'c'
		}
		dst = append(dst, c)
	}
	return dst
}

func isASCII(w string) bool {
	for i := 0; i < len(w); i++ {
		if w[i] >= utf8.RuneSelf {
			return false
		}
	}
	return true
}

// keys calls f with the canonical form of w and every string made by deleting one rune of
// it, each as UTF-8 bytes that f must not keep. Two words within one plain edit plus any
// number of OCR confusions share a key (the "symmetric delete" idea), so with costs of at
// most 1 no candidate is missed, apart from rare interactions of an edit with a two-character
// confusion. ASCII words (nearly all) are handled on bytes, without allocating.
func (ix *Index) keys(w string, f func([]byte)) {
	if len(w) <= 64 && isASCII(w) {
		var cb, bb [64]byte
		c := canonicalASCII(cb[:0], w)
		f(c)
		if ix.canonOnly {
			return
		}
		for i := range c {
			if i > 0 && c[i] == c[i-1] {
				continue // same string as deleting c[i-1]
			}
			f(append(append(bb[:0], c[:i]...), c[i+1:]...))
		}
		return
	}
	ix.keysRunes(w, f)
}

// keysRunes is keys on runes, for any word.
func (ix *Index) keysRunes(w string, f func([]byte)) {
	c := canonical(w)
	var out []byte
	out = appendRunes(out[:0], c)
	f(out)
	if ix.canonOnly {
		return
	}
	buf := make([]rune, 0, len(c))
	for i := range c {
		if i > 0 && c[i] == c[i-1] {
			continue // same string as deleting c[i-1]
		}
		buf = append(append(buf[:0], c[:i]...), c[i+1:]...)
		out = appendRunes(out[:0], buf)
		f(out)
	}
}

// appendRunes appends rs as UTF-8, as string(rs) would spell it.
func appendRunes(dst []byte, rs []rune) []byte {
	for _, r := range rs {
		dst = utf8.AppendRune(dst, r)
	}
	return dst
}

// NewIndex indexes the target words (duplicates are ignored) for queries with costs up to 1.
func NewIndex(targets []string) *Index { return NewIndexLimit(targets, 1) }

// NewIndexLimit is NewIndex for queries whose maxCost is at most limit. Below 1 only OCR
// confusions (cost 0.5 each) are within reach, and two words within confusions of each other
// have the same canonical form, so only canonical forms are indexed (much smaller and faster).
func NewIndexLimit(targets []string, limit float64) *Index {
	ix := &Index{del: make(map[string][]int32), canonOnly: limit < 1}
	seen := make(map[string]bool)
	for _, t := range targets {
		if seen[t] {
			continue
		}
		seen[t] = true
		id := int32(len(ix.targets))
		ix.targets = append(ix.targets, t)
		ix.runes = append(ix.runes, []rune(t))
		ix.keys(t, func(s []byte) {
			l := ix.del[string(s)]
			if len(l) == 0 || l[len(l)-1] != id {
				ix.del[string(s)] = append(l, id)
			}
		})
	}
	return ix
}

// Best returns the unique target closest to w within maxCost (at most 1, see keys). ok is
// false when no target is that close or when two or more targets share the smallest distance
// (ambiguous). w itself is never returned.
func (ix *Index) Best(w string, maxCost float64) (target string, cost float64, ok bool) {
	rw := []rune(w)
	var cands []int32
	if ix.canonOnly && maxCost >= 1 {
		panic("repair: Index built with NewIndexLimit below 1 queried with maxCost >= 1")
	}
	ix.keys(w, func(s []byte) {
		cands = append(cands, ix.del[string(s)]...)
	})
	sort.Slice(cands, func(i, j int) bool { return cands[i] < cands[j] })
	best, second := maxCost+1, maxCost+1
	bestID := int32(-1)
	for k, id := range cands {
		if k > 0 && cands[k-1] == id {
			continue
		}
		t := ix.runes[id]
		if d := len(t) - len(rw); d > 2 || d < -2 || ix.targets[id] == w {
			continue // no two edits and confusions of cost <= 1 change the length more
		}
		c := distance(rw, t)
		if c < best {
			second, best, bestID = best, c, id
		} else if c < second {
			second = c
		}
	}
	if bestID < 0 || best > maxCost || second <= best {
		return "", 0, false
	}
	return ix.targets[bestID], best, true
}

// Correction is one entry of the repair audit.
type Correction struct {
	From  string  `json:"from"`  // the word as found (normalised)
	To    string  `json:"to"`    // the word it was replaced by
	Kind  string  `json:"kind"`  // "ocr" (edit distance) or "join" (split word rejoined; From holds "a b")
	Cost  float64 `json:"cost"`  // weighted distance (0 for joins)
	Count int     `json:"count"` // occurrences corrected in the corpus
}

// SortCorrections orders an audit by kind, then From.
func SortCorrections(cs []Correction) {
	sort.Slice(cs, func(i, j int) bool {
		if cs[i].Kind != cs[j].Kind {
			return cs[i].Kind < cs[j].Kind
		}
		return cs[i].From < cs[j].From
	})
}

// WriteCSV writes the audit as CSV with the header kind,from,to,cost,count.
func WriteCSV(w io.Writer, cs []Correction) error {
	cw := csv.NewWriter(w)
	if err := cw.Write([]string{"kind", "from", "to", "cost", "count"}); err != nil {
		return err
	}
	for _, c := range cs {
		rec := []string{c.Kind, c.From, c.To, strconv.FormatFloat(c.Cost, 'g', -1, 64), strconv.Itoa(c.Count)}
		if err := cw.Write(rec); err != nil {
			return err
		}
	}
	cw.Flush()
	return cw.Error()
}
