package redact

import (
	"fmt"
	"regexp"
	"sort"
	"strconv"
	"strings"
	"undercurrent/text/lexicon"
	"unicode"
	"unicode/utf8"
)

// Options configures a Redactor. The zero Options redacts every type, with no name list and
// no allow-list.
type Options struct {
	// Names lists people to redact wherever they appear: full names ("Ann Quosby") or single
	// names. Matching ignores case; each word of five or more letters also matches a word
	// one edit away (a substitution, insertion, deletion or swap of neighbours). Each part of
	// a listed full name is also redacted on its own when it is written capitalised, except
	// before a street suffix or a business word ("Hallowmere Cir", "Tarrowby Hardware").
	// A one-word entry that is a dictionary word ("Will", "Rose") matches only when capitalised.
	Names []string
	// Allow lists words and phrases that must never be redacted as names, such as street,
	// business and place names ("Quosby Hardware", "Elm"). Matching ignores case and respects
	// word boundaries. Allow wins over every name rule, listed names included; it does not
	// stop a street address from being redacted.
	Allow []string
	// Types selects the detectors to run. The zero value runs all of them.
	Types TypeSet
	// NoHeuristicNames turns off the guess that a capitalised word missing from the
	// dictionary is a name. Cue and list names are still found.
	NoHeuristicNames bool
}

// Redactor redacts narratives. It is safe for concurrent use.
type Redactor struct {
	opt   Options
	list  [][]string // tokenised Names entries, lower case
	index *listIndex
	allow [][]string // tokenised Allow entries
}

// New returns a Redactor for opt. It returns an error when a Names or Allow entry has no
// letters.
func New(opt Options) (*Redactor, error) {
	r := &Redactor{opt: opt}
	for i, n := range opt.Names {
		ws := wordsOf(n)
		if len(ws) == 0 {
			return nil, fmt.Errorf("redact: Names[%d] %q has no letters", i, n)
		}
		for k := range ws {
			ws[k] = strings.ToLower(ws[k])
		}
		r.list = append(r.list, ws)
	}
	if len(r.list) > 0 {
		r.index = newListIndex(r.list)
	}
	for i, a := range opt.Allow {
		ws := wordsOf(a)
		if len(ws) == 0 {
			return nil, fmt.Errorf("redact: Allow[%d] %q has no letters", i, a)
		}
		r.allow = append(r.allow, ws)
	}
	return r, nil
}

// maxPasses bounds the fixed-point loop in Redact. Each pass can only add replacements, so
// the loop ends long before this on real text.
const maxPasses = 32

// Redact returns text with every detected item replaced by its placeholder, and the
// replacements in input order. Spans refer to byte offsets in text. The same text always
// gives the same output, and Redact(out) returns out unchanged: the detectors run again on
// their own output until they find nothing new, and placeholders already in text are
// kept (new names are numbered after the highest [NAME-n] present).
func (r *Redactor) Redact(text string) (out string, spans []Span) {
	out = text
	var all []Span // in original coordinates, sorted, non-overlapping
	var memo scanMemo
	for n := 0; n < maxPasses; n++ {
		if n > 0 {
			memo.next()
		}
		found := r.pass(out, &memo)
		if len(found) == 0 {
			break
		}
		if n == 0 {
			all = found
		} else {
			all = mergeSpans(all, found, text)
		}
		out = render(text, all)
	}
	return out, all
}

// mergeSpans maps spans found in render(text, prev) back to text and merges them with prev.
// Spans found in a later pass never overlap a placeholder, so each lies in literal text.
func mergeSpans(prev, found []Span, text string) []Span {
	out := make([]Span, 0, len(prev)+len(found))
	out = append(out, prev...)
	for _, f := range found {
		// walk prev to convert rendered offset to original offset.
		shift := 0 // original - rendered before f.Start
		for _, p := range prev {
			pr := p.Start - shift // rendered start of p
			if pr >= f.Start {
				break
			}
			shift += (p.End - p.Start) - len(p.Placeholder)
		}
		s := f
		s.Start = f.Start + shift
		s.End = f.End + shift
		s.Text = text[s.Start:s.End]
		out = append(out, s)
	}
	sort.Slice(out, func(i, j int) bool { return out[i].Start < out[j].Start })
	return out
}

// render replaces each span of text by its placeholder.
func render(text string, spans []Span) string {
	var b strings.Builder
	b.Grow(len(text))
	at := 0
	for _, s := range spans {
		b.WriteString(text[at:s.Start])
		b.WriteString(s.Placeholder)
		at = s.End
	}
	b.WriteString(text[at:])
	return b.String()
}

// cand is a detector's find before overlaps are resolved.
type cand struct {
	typ        Type
	start, end int
	parts      []string // names: lower-case name words used to number people
}

// priority of each type when finds overlap; higher wins.
var priority = [...]int{Email: 10, VIN: 9, SSN: 8, Phone: 7, CaseNo: 6, DOB: 6, Address: 5, Plate: 5, Age: 4, Name: 3}

var placeholderRe = regexp.MustCompile(`\[(?:NAME-[0-9]+|PHONE|EMAIL|SSN|DOB|AGE|PLATE|VIN|ADDRESS|CASE-NO)\]`)

// pass runs every detector once over text and returns the replacements, in text order.
// memo, which may be nil, carries pattern matches from pass to pass.
func (r *Redactor) pass(text string, memo *scanMemo) []Span {
	masks := placeholderRe.FindAllStringIndex(text, -1)
	nextName := 1
	for _, m := range masks {
		if strings.HasPrefix(text[m[0]:], "[NAME-") {
			if n, err := strconv.Atoi(text[m[0]+6 : m[1]-1]); err == nil && n >= nextName && n < 1<<30 {
				nextName = n + 1
			}
		}
	}
	// Detectors read a copy in which HTML residue ("&nbsp;", "<br />") is blanked out
	// byte for byte, so offsets stay those of text.
	view := text
	if strings.ContainsAny(view, "&<") {
		view = htmlView.Replace(view)
	}
	d := &doc{text: ocrCues(view), orig: text, r: r, masks: masks, memo: memo, bufs: docPool.Get().(*docBufs)}
	defer d.release()
	d.tokenize()
	var cs []cand
	t := r.opt.Types
	if t.Has(Email) {
		cs = d.emails(cs)
	}
	if t.Has(Phone) {
		cs = d.phones(cs)
	}
	if t.Has(SSN) {
		cs = d.ssns(cs)
	}
	if t.Has(VIN) {
		cs = d.vins(cs)
	}
	if t.Has(DOB) {
		cs = d.dobs(cs)
	}
	if t.Has(Age) {
		cs = d.ages(cs)
	}
	if t.Has(Plate) {
		cs = d.plates(cs)
	}
	if t.Has(Address) {
		cs = d.addresses(cs)
	}
	if t.Has(CaseNo) {
		cs = d.caseNos(cs)
	}
	if t.Has(Name) {
		cs = d.names(cs)
	}
	cs = d.resolve(cs)
	return d.finish(cs, nextName)
}

// htmlView blanks common HTML residue with as many spaces as it has bytes ("&amp;" keeps
// its "&"), so that a cue and its value separated by "&nbsp;" are still found.
var htmlView = strings.NewReplacer(
	"&nbsp;", "      ", "&NBSP;", "      ", "&amp;", "&    ", "<br />", "      ", "<br/>", "     ",
	"<br>", "    ", "<BR>", "    ", "<p>", "   ", "</p>", "    ", "<P>", "   ", "</P>", "    ",
)

// cueWords are the cue words that ocrCues restores.
var cueWords = []string{"case", "plate", "registration", "report", "incident", "birth", "phone",
	"victim", "suspect", "witness", "caller", "identified", "complainant", "driver", "named"}

// cuesByLen lists cueWords by length, each list in cueWords' order.
var cuesByLen = func() (t [16][]string) {
	for _, c := range cueWords {
		t[len(c)] = append(t[len(c)], c)
	}
	return t
}()

// ocrCues returns text with each word that is not a dictionary word (or is one, before "#")
// but differs from a cue
// word in exactly one letter of the same length ("casc", "platc", "registrati0n") spelled
// as that cue word: OCR confusions of a cue should not hide what follows it. Offsets are
// kept.
func ocrCues(text string) string {
	listsOnce.Do(loadLists)
	var b []byte
	for i := 0; i < len(text); {
		if !isAlnumByte(text[i]) {
			i++
			continue
		}
		j := i
		for j < len(text) && isAlnumByte(text[j]) {
			j++
		}
		if w := text[i:j]; len(w) >= 4 && len(w) <= 12 {
			if c := ocrCue(w, hashAfter(text, j)); c != "" {
				if b == nil {
					b = []byte(text)
				}
				copy(b[i:j], c)
			}
		}
		// a cue split in two by a stray space or a line-end hyphen ("pla te",
		// "num- ber"): written joined, the gap moved after it.
		if k, gap := splitGap(text, j); gap > 0 {
			m := k
			for m < len(text) && isAlnumByte(text[m]) {
				m++
			}
			// both parts are ASCII letters and digits: lower-case them byte by byte into
			// a small buffer; no cue is longer than it.
			var jb [16]byte
			if n := (j - i) + (m - k); m > k && n <= len(jb) && splitLens[lowerByte(text[i])]&(1<<n) != 0 && splitCues[string(lowerASCIIInto(jb[:0], text[i:j], text[k:m]))] {
				joined := lowerASCIIInto(jb[:0], text[i:j], text[k:m])
				if b == nil {
					b = []byte(text)
				}
				copy(b[i:], joined)
				for p := i + len(joined); p < m; p++ {
					b[p] = ' '
				}
				i = m
				continue
			}
		}
		i = j
	}
	if b == nil {
		return text
	}
	return string(b)
}

// lowerASCIIInto appends the ASCII strings parts, lower-cased, to dst.
func lowerASCIIInto(dst []byte, parts ...string) []byte {
	for _, p := range parts {
		for i := 0; i < len(p); i++ {
			c := p[i]
			if c >= 'A' && c <= 'Z' {
				c += 'a' - 'A'
			}
			dst = append(dst, c)
		}
	}
	return dst
}

// splitCues are the cue words ocrCues rejoins when split.
var splitCues = set("case plate registration report incident birth phone victim suspect witness caller identified complainant driver named number stated")

// splitLens has bit n of entry c set when a word of splitCues starts with the byte c and
// has n bytes: a pair of words that cannot join into a cue is rejected without building
// and looking up the joined word.
var splitLens = byFirstAndLen(splitCues)

// byFirstAndLen returns, for the words of set (each shorter than 64 bytes), a table whose
// entry c has bit n set when some word starts with byte c and has n bytes.
func byFirstAndLen[V any](set map[string]V) *[256]uint64 {
	var t [256]uint64
	for w := range set {
		if len(w) >= 64 {
			panic("redact: word too long for byFirstAndLen: " + w)
		}
		if w != "" {
			t[w[0]] |= 1 << len(w)
		}
	}
	return &t
}

// lowerByte lower-cases an ASCII capital.
func lowerByte(c byte) byte {
	if c >= 'A' && c <= 'Z' {
		c += 'a' - 'A'
	}
	return c
}

// splitGap returns the start of the next word and the gap's length when text[j:] is a
// single space, or "-" followed by a space or a line break, before a letter or digit.
func splitGap(text string, j int) (int, int) {
	switch {
	case j+1 < len(text) && text[j] == ' ' && isAlnumByte(text[j+1]):
		return j + 1, 1
	case j+2 < len(text) && text[j] == '-' && (text[j+1] == ' ' || text[j+1] == '\n') && isAlnumByte(text[j+2]):
		return j + 2, 2
	}
	return 0, 0
}

// hashAfter reports whether "#" follows position j, after optional spaces.
func hashAfter(text string, j int) bool {
	for j < len(text) && text[j] == ' ' {
		j++
	}
	return j < len(text) && text[j] == '#'
}

// ocrCue returns the cue word that w (one letter off) stands for, or "". A dictionary word
// ("ease") counts only when "#" follows it, as in "ease #24-085853".
func ocrCue(w string, hash bool) string {
	if len(w) >= len(cuesByLen) {
		return ""
	}
	for _, c := range cuesByLen[len(w)] {
		diff, digits := 0, 0
		for k := 0; k < len(c) && diff < 2; k++ {
			b := w[k]
			if b >= 'A' && b <= 'Z' {
				b += 'a' - 'A'
			}
			if b >= '0' && b <= '9' {
				digits++
			}
			if c[k] != b {
				diff++
			}
		}
		if diff == 1 && digits <= 1 && (hash || !lexicon.Has(strings.ToLower(w))) {
			return c
		}
	}
	return ""
}

// overlapsMask reports whether [s,e) overlaps a placeholder.
func (d *doc) overlapsMask(s, e int) bool {
	i := sort.Search(len(d.masks), func(i int) bool { return d.masks[i][1] > s })
	return i < len(d.masks) && d.masks[i][0] < e
}

// resolve drops finds inside placeholders and settles overlaps: higher priority, then the
// longer find, then the earlier one wins. The result is sorted by start.
func (d *doc) resolve(cs []cand) []cand {
	keep := cs[:0]
	for _, c := range cs {
		if c.start < c.end && !d.overlapsMask(c.start, c.end) {
			keep = append(keep, c)
		}
	}
	cs = keep
	sort.SliceStable(cs, func(i, j int) bool {
		a, b := cs[i], cs[j]
		if priority[a.typ] != priority[b.typ] {
			return priority[a.typ] > priority[b.typ]
		}
		if a.end-a.start != b.end-b.start {
			return a.end-a.start > b.end-b.start
		}
		if a.start != b.start {
			return a.start < b.start
		}
		return a.typ < b.typ
	})
	var iv intervals
	out := make([]cand, 0, len(cs))
	for _, c := range cs {
		if iv.overlaps(c.start, c.end) {
			continue
		}
		iv.add(c.start, c.end)
		out = append(out, c)
	}
	sort.Slice(out, func(i, j int) bool { return out[i].start < out[j].start })
	return out
}

// intervals is a sorted set of disjoint half-open intervals.
type intervals struct{ s, e []int }

func (v *intervals) overlaps(s, e int) bool {
	i := sort.SearchInts(v.e, s+1) // first interval ending after s
	return i < len(v.s) && v.s[i] < e
}

func (v *intervals) add(s, e int) {
	i := sort.SearchInts(v.s, s)
	v.s = append(v.s, 0)
	v.e = append(v.e, 0)
	copy(v.s[i+1:], v.s[i:])
	copy(v.e[i+1:], v.e[i:])
	v.s[i], v.e[i] = s, e
}

// person is one numbered name within a narrative.
type person struct {
	num   int
	parts []string
	last  int // index of the latest mention, to break ties
}

// finish numbers the names, extends every find to the other occurrences of its text, and
// builds the spans.
func (d *doc) finish(cs []cand, nextName int) []Span {
	var people []*person
	nums := make([]int, len(cs))
	for i, c := range cs {
		if c.typ != Name {
			continue
		}
		p := matchPerson(people, c.parts)
		if p == nil {
			p = &person{num: nextName, parts: append([]string(nil), c.parts...)}
			nextName++
			people = append(people, p)
		} else {
			for _, w := range c.parts {
				if !contains(p.parts, w) {
					p.parts = append(p.parts, w)
				}
			}
		}
		p.last = i
		nums[i] = p.num
	}
	// Other occurrences of replaced text (and of each word of a name) get the same
	// placeholder.
	var iv intervals
	for _, c := range cs {
		iv.add(c.start, c.end)
	}
	type extra struct {
		c   cand
		num int
	}
	var extras []extra
	seen := map[string]bool{}
	type mention struct{ pos, num int }
	words := map[string][]mention{} // name word → its mentions, in text order
	for i, c := range cs {
		nd := d.text[c.start:c.end]
		key := strconv.Itoa(int(c.typ)) + "\x00" + strconv.Itoa(nums[i]) + "\x00" + nd
		if c.typ == Name {
			for _, w := range d.nameWords(c.start, c.end) {
				words[w] = append(words[w], mention{c.start, nums[i]})
			}
		}
		if seen[key] || len(nd) < 2 {
			continue
		}
		seen[key] = true
		for _, s := range d.occurrences(nd) {
			e := s + len(nd)
			if iv.overlaps(s, e) || d.overlapsMask(s, e) || (c.typ == Name && d.allowed(s, e)) {
				continue
			}
			iv.add(s, e)
			extras = append(extras, extra{cand{typ: c.typ, start: s, end: e}, nums[i]})
		}
	}
	// A name word on its own ("Smith") goes to the person last mentioned with it before
	// that point, or to the first such person when it comes before them all.
	keys := make([]string, 0, len(words))
	for w := range words {
		keys = append(keys, w)
	}
	sort.Strings(keys)
	for _, w := range keys {
		ms := words[w]
		for _, s := range d.occurrences(w) {
			e := s + len(w)
			if iv.overlaps(s, e) || d.overlapsMask(s, e) || d.allowed(s, e) {
				continue
			}
			num := ms[0].num
			for _, m := range ms {
				if m.pos < s {
					num = m.num
				}
			}
			iv.add(s, e)
			extras = append(extras, extra{cand{typ: Name, start: s, end: e}, num})
		}
	}
	spans := make([]Span, 0, len(cs)+len(extras))
	for i, c := range cs {
		spans = append(spans, d.span(c, nums[i]))
	}
	for _, x := range extras {
		spans = append(spans, d.span(x.c, x.num))
	}
	sort.Slice(spans, func(i, j int) bool { return spans[i].Start < spans[j].Start })
	return spans
}

func (d *doc) span(c cand, num int) Span {
	ph := "[" + typeTags[c.typ] + "]"
	if c.typ == Name {
		ph = "[NAME-" + strconv.Itoa(num) + "]"
	}
	return Span{Type: c.typ, Start: c.start, End: c.end, Placeholder: ph, Text: d.orig[c.start:c.end]}
}

// matchPerson finds the person a name with these parts refers to, or nil.
func matchPerson(people []*person, parts []string) *person {
	if len(parts) == 0 {
		return nil
	}
	key := strings.Join(parts, " ")
	for _, p := range people {
		if strings.Join(p.parts, " ") == key {
			return p
		}
	}
	var best *person
	if len(parts) == 1 {
		// "Smith" after "John Smith": the latest person with that word.
		for _, p := range people {
			if contains(p.parts, parts[0]) && (best == nil || p.last > best.last) {
				best = p
			}
		}
		return best
	}
	// "John Smith" after "Smith": a single-word person matching one of the words.
	for _, p := range people {
		if len(p.parts) == 1 && contains(parts, p.parts[0]) && (best == nil || p.last > best.last) {
			best = p
		}
	}
	return best
}

func contains(ss []string, s string) bool {
	for _, x := range ss {
		if x == s {
			return true
		}
	}
	return false
}

// occurrences returns the starts of every occurrence of needle in the text that does not
// continue a word on either side.
func (d *doc) occurrences(needle string) []int {
	// find the first word of needle and its offset.
	off := -1
	var first string
	for i, r := range needle {
		if isWordRune(r) {
			off = i
			j := i
			for j < len(needle) {
				r2, n := utf8.DecodeRuneInString(needle[j:])
				if !isWordRune(r2) {
					break
				}
				j += n
			}
			first = needle[i:j]
			break
		}
	}
	if off < 0 {
		return nil
	}
	if d.valid == 0 {
		d.valid = 2
		if utf8.ValidString(d.text) {
			d.valid = 1
		}
	}
	if d.valid == 1 && utf8.ValidString(needle) {
		// In valid UTF-8 a match of needle starts on a rune boundary, and boundedAt makes
		// the first word of a match a maximal letter-or-digit run (the needle's own
		// non-word runes bound it inside): the same starts as the word index gives, in the
		// same order, without building the index.
		var out []int
		for at := 0; at+len(needle) <= len(d.text); {
			j := strings.Index(d.text[at:], needle)
			if j < 0 {
				break
			}
			s := at + j
			if boundedAt(d.text, s, s+len(needle)) {
				out = append(out, s)
			}
			at = s + 1
		}
		return out
	}
	d.index()
	var out []int
	for _, ws := range d.wordIndex[first] {
		s := ws - off
		if s < 0 || s+len(needle) > len(d.text) || d.text[s:s+len(needle)] != needle {
			continue
		}
		if boundedAt(d.text, s, s+len(needle)) {
			out = append(out, s)
		}
	}
	return out
}

// boundedAt reports whether text[s:e] neither continues a word before s nor after e.
func boundedAt(text string, s, e int) bool {
	if s > 0 {
		a, _ := utf8.DecodeRuneInString(text[s:])
		b, _ := utf8.DecodeLastRuneInString(text[:s])
		if isWordRune(a) && isWordRune(b) {
			return false
		}
	}
	if e < len(text) && e > s {
		a, _ := utf8.DecodeLastRuneInString(text[:e])
		b, _ := utf8.DecodeRuneInString(text[e:])
		if isWordRune(a) && isWordRune(b) {
			return false
		}
	}
	return true
}

func isWordRune(r rune) bool { return unicode.IsLetter(r) || unicode.IsDigit(r) }
