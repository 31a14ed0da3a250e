package intake

import (
	"slices"
	"strings"
)

// sampleSize bounds the rows whose statistics choose the columns (see sampleStep).
const sampleSize = 5000

// tally gathers in one pass over the parsed rows everything the column choices and the
// date reading need, so that a file can be decided on before it is read a second time
// (Stream) with the same outcome as when every row is in memory (Read):
//
//   - a sample of the rows: every s-th row (rows 0, s, 2s, ... counted over all files in
//     order), s the smallest power of two that leaves at most sampleSize rows. It is
//     kept while reading by doubling s (and dropping every other sampled row) whenever
//     the sample would grow past sampleSize;
//   - for columns whose header looks like an id (or names Options.ID), a 64-bit FNV-1a
//     hash of each row's trimmed value (8 bytes a row, sorted at the end to count the
//     distinct values and find the repeated ones);
//   - for every column, the counts that decide a date column's reading (dateTally),
//     taken with Options.Time's column as the date column's time.
type tally struct {
	opt    *Options
	n      int // rows tallied
	step   int
	sample []sampled
	tabs   []*tableTally
	// headers, when not nil, are the files' whole headers (known from an earlier pass).
	headers [][]string
}

type sampled struct {
	ti, idx int
	r       rawRow
}

// tableTally is the tally of one file, by its own column order.
type tableTally struct {
	cols      []colTally
	timeIdx   int  // Options.Time's column in this file, -1 none (yet)
	timeUsed  bool // a row was tallied with timeIdx ≥ 0
	timeMoved bool // timeIdx changed after it was used (JSON keys seen late)
}

type colTally struct {
	idLike bool
	ids    []uint64 // id-like columns only: the hash of each non-empty value
	dates  dateTally
}

func newTally(opt *Options) *tally { return &tally{opt: opt, step: 1} }

// idLike reports whether a column's values are counted: a header that looks like an
// id, or the one Options.ID names.
func idLike(h string, opt *Options) bool {
	return hintID(h) > 0 || (opt.ID != "" && opt.ID != "-" && strings.EqualFold(h, opt.ID))
}

// add tallies row r of file ti, whose header (so far, for JSON) is header.
func (s *tally) add(ti int, header []string, r rawRow) {
	for len(s.tabs) <= ti {
		s.tabs = append(s.tabs, &tableTally{timeIdx: -1})
	}
	tt := s.tabs[ti]
	if s.headers != nil {
		header = s.headers[ti]
	}
	if len(header) > len(tt.cols) || len(r.f) > len(tt.cols) {
		for c := len(tt.cols); c < max(len(header), len(r.f)); c++ {
			var ct colTally
			ct.idLike = c < len(header) && idLike(header[c], s.opt)
			tt.cols = append(tt.cols, ct)
		}
		if s.opt.Time != "" {
			i, err := findColumn("", "time", s.opt.Time, header)
			if err != nil {
				i = -1
			}
			if i != tt.timeIdx {
				if tt.timeIdx >= 0 && tt.timeUsed {
					tt.timeMoved = true
				}
				tt.timeIdx = i
			}
		}
	}
	if s.n%s.step == 0 {
		s.sample = append(s.sample, sampled{ti, s.n, r})
		if len(s.sample) > sampleSize {
			s.step *= 2
			k := s.sample[:0]
			for _, x := range s.sample {
				if x.idx%s.step == 0 {
					k = append(k, x)
				}
			}
			clear(s.sample[len(k):])
			s.sample = k
		}
	}
	s.n++
	tv := ""
	if tt.timeIdx >= 0 {
		tt.timeUsed = true
		if tt.timeIdx < len(r.f) {
			tv = strings.TrimSpace(r.f[tt.timeIdx])
		}
	}
	for c, v := range r.f {
		v = strings.TrimSpace(v)
		if v == "" {
			continue
		}
		ct := &tt.cols[c]
		if ct.idLike {
			ct.ids = append(ct.ids, hashString(v))
		}
		ct.dates.add(v, tv)
	}
}

// survey is a tally merged over the files, in the first file's column order.
type survey struct {
	n         int
	sample    []rowRef
	distinctN []int               // per column: distinct non-empty values, -1 when not counted
	repeated  []map[uint64]uint32 // per id-like column: rows per value hash, for values in several rows
	dates     []dateTally
	timeMoved bool
}

// distinct is the number of distinct non-empty values of column c (-1: not counted).
func (sv *survey) distinct(c int) int { return sv.distinctN[c] }

// finish merges the files' tallies; perms are align's permutations.
func (s *tally) finish(tabs []*table, perms [][]int) *survey {
	header := tabs[0].header
	sv := &survey{n: s.n, distinctN: make([]int, len(header)), repeated: make([]map[uint64]uint32, len(header)), dates: make([]dateTally, len(header))}
	for c := range header {
		var hs []uint64
		counted := false
		for ti, tt := range s.tabs {
			p := c
			if perms[ti] != nil {
				p = perms[ti][c]
			}
			if p >= len(tt.cols) {
				continue
			}
			ct := &tt.cols[p]
			sv.dates[c].addAll(ct.dates)
			if ct.idLike {
				counted = true
				if hs == nil {
					hs = ct.ids
				} else {
					hs = append(hs, ct.ids...)
				}
				ct.ids = nil
			}
		}
		sv.distinctN[c] = -1
		if !counted {
			continue
		}
		slices.Sort(hs)
		sv.distinctN[c] = 0
		rep := map[uint64]uint32{}
		for i := 0; i < len(hs); {
			j := i + 1
			for j < len(hs) && hs[j] == hs[i] {
				j++
			}
			sv.distinctN[c]++
			if j-i > 1 {
				rep[hs[i]] = uint32(j - i)
			}
			i = j
		}
		sv.repeated[c] = rep
	}
	for _, tt := range s.tabs {
		sv.timeMoved = sv.timeMoved || tt.timeMoved
	}
	sv.sample = make([]rowRef, len(s.sample))
	for i, x := range s.sample {
		t := tabs[x.ti]
		sv.sample[i] = rowRef{file: rowFile(t, x.r), fi: x.ti, line: x.r.line, f: permute(pad(x.r.f, len(t.header)), perms[x.ti])}
	}
	return sv
}

func rowFile(t *table, r rawRow) string {
	if r.file != "" {
		return r.file
	}
	return t.info.Path
}

// permute returns f in the first file's column order (f itself when perm is nil).
func permute(f []string, perm []int) []string {
	if perm == nil {
		return f
	}
	g := make([]string, len(perm))
	for j, p := range perm {
		g[j] = f[p]
	}
	return g
}

// hashString is 64-bit FNV-1a (Fowler, Noll and Vo; offset basis 14695981039346656037,
// prime 1099511628211). Distinct values share a hash with probability about n²/2⁶⁵
// (under 3·10⁻⁸ for a million values): a collision can only lower a distinct count by
// one or make two ids look alike to the first pass, which the second pass then tells
// apart by the ids themselves.
func hashString(s string) uint64 {
	h := uint64(14695981039346656037)
	for i := 0; i < len(s); i++ {
		h ^= uint64(s[i])
		h *= 1099511628211
	}
	return h
}

// dateTally counts what decides a date column's reading (see decideReading): values,
// Excel-serial-like numbers, numeric D/M/Y-or-M/D/Y values, and those whose first or
// second field is above 12.
type dateTally struct {
	nonEmpty, numeric, slashed, firstBig, secondBig int
}

func (d *dateTally) addAll(o dateTally) {
	d.nonEmpty += o.nonEmpty
	d.numeric += o.numeric
	d.slashed += o.slashed
	d.firstBig += o.firstBig
	d.secondBig += o.secondBig
}

// add counts the value v (trimmed, not empty) with the time tv (trimmed, "" for none),
// read as v + " " + tv. The regular expressions are only tried where they can match:
// a serial number and a numeric date start with a digit, a weekday name with one of
// "mtwfs".
func (d *dateTally) add(v, tv string) {
	d.nonEmpty++
	c := v[0]
	switch {
	case c >= '0' && c <= '9':
		if tv == "" && reSerial.MatchString(v) {
			d.numeric++
			return
		}
	case strings.IndexByte("mtwfsMTWFS", c) >= 0:
		if tv != "" {
			v += " " + tv
		}
		w := weekdayPrefix.ReplaceAllString(v, "")
		if len(w) == len(v) || w == "" || w[0] < '0' || w[0] > '9' {
			return
		}
		v = w
	default:
		return
	}
	if m := reNum.FindStringSubmatch(v); m != nil && m[2] == m[4] {
		d.slashed++
		a, b := atoi(m[1]), atoi(m[3])
		if a > 12 && b <= 12 {
			d.firstBig++
		}
		if b > 12 && a <= 12 {
			d.secondBig++
		}
	}
}
