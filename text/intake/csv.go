package intake

import (
	"bufio"
	"context"
	"encoding/csv"
	"errors"
	"fmt"
	"io"
	"strings"
	"unicode/utf8"
)

// sniffDelimiter chooses the field separator from the first records of decoded text.
// For each candidate (',', '\t', ';', '|', in that order of preference) it counts the
// candidate outside double quotes on each of the first 50 records (a record may span
// lines inside quotes) and takes the mode of the counts. The winner has a mode > 0 and
// the most records at its mode (ties: the larger mode, then the order above).
//
// skip is the number of physical lines before the header: a preamble such as a report
// title. Leading records are a preamble when each has fewer separators than the mode,
// they are fewer than 20, and of the records after them at least 5 and at least 80%
// sit at the mode.
//
// spaced reports the ", " separator: a comma winner where every separator of the
// header line is followed by a space (the safenet exports).
func sniffDelimiter(sample []byte) (delim rune, spaced bool, skip int) {
	cands := []byte{',', '\t', ';', '|'}
	type rec struct {
		n          [4]int
		line       int // physical line (0-based) where the record starts
		spaceAfter int // commas followed by a space
	}
	var recs []rec
	cur := rec{}
	line := 0
	inQ := false
	for i := 0; i < len(sample) && len(recs) < 50; i++ {
		c := sample[i]
		switch {
		case c == '"':
			inQ = !inQ
		case c == '\n':
			line++
			if !inQ {
				recs = append(recs, cur)
				cur = rec{line: line}
			}
		case inQ:
		default:
			for k, d := range cands {
				if c == d {
					cur.n[k]++
					if k == 0 && i+1 < len(sample) && sample[i+1] == ' ' {
						cur.spaceAfter++
					}
				}
			}
		}
	}
	if len(recs) < 50 && cur.n != ([4]int{}) {
		recs = append(recs, cur)
	}
	if len(recs) == 0 {
		return singleColumn, false, 0
	}
	best, bestScore, bestMode := -1, -1, 0
	for k := range cands {
		freq := map[int]int{}
		for _, r := range recs {
			freq[r.n[k]]++
		}
		mode, score := 0, 0
		for n, f := range freq {
			if n > 0 && (f > score || (f == score && n > mode)) {
				mode, score = n, f
			}
		}
		if mode == 0 {
			continue
		}
		if score > bestScore || (score == bestScore && mode > bestMode) {
			best, bestScore, bestMode = k, score, mode
		}
	}
	if best < 0 {
		return singleColumn, false, 0
	}
	h := 0
	for h < len(recs) && h < 20 && recs[h].n[best] < bestMode {
		h++
	}
	if h > 0 {
		at := 0
		for _, r := range recs[h:] {
			if r.n[best] == bestMode {
				at++
			}
		}
		if h == len(recs) || h == 20 || at < 5 || 5*at < 4*len(recs[h:]) {
			h = 0
		}
	}
	hdr := recs[h]
	if hdr.n[best] == 0 {
		// The header has no separator at all: a single column, whatever the rows hold.
		return singleColumn, false, hdr.line
	}
	if best == 0 && hdr.n[0] > 0 && hdr.spaceAfter == hdr.n[0] {
		return ',', true, hdr.line
	}
	return rune(cands[best]), false, hdr.line
}

// singleColumn is the delimiter used for a file of one column: the ASCII unit
// separator, which text exports do not hold.
const singleColumn = '\x1f'

func delimName(d rune, spaced bool) string {
	if spaced {
		return ", "
	}
	if d == singleColumn {
		return ""
	}
	return string(d)
}

// readCSV reads delimited text. Quoting follows RFC 4180 through encoding/csv with
// LazyQuotes off (unless Options.LazyQuotes). A row whose field count differs from
// the header's is rejected as a ragged row; a row with bad quoting is rejected with the
// parser's line and column; a quoted field that never closes is an error, since the
// rest of the file was swallowed by it.
func (ps *pass) readCSV(ctx context.Context, name string, br *bufio.Reader, peek []byte, ext string, dec decision, tail *tailTracker, opt *Options) (*table, error) {
	delim, spaced := opt.Delimiter, false
	sniffed, sp, skip := sniffDelimiter(peek)
	if opt.SkipLines > 0 {
		skip = opt.SkipLines
	} else if opt.SkipLines < 0 || (delim != 0 && delim != sniffed) {
		skip = 0
	}
	if delim == ',' && sniffed == ',' {
		spaced = sp
	}
	if delim == 0 {
		delim, spaced = sniffed, sp
		if hdr, _, _ := strings.Cut(string(peek[:min(len(peek), 4096)]), "\n"); ext == ".tsv" && strings.Contains(hdr, "\t") {
			delim, spaced = '\t', false
		}
	}
	t := ps.table(FileInfo{Path: name, Format: "csv", Delimiter: delimName(delim, spaced)})
	if delim == '\t' {
		t.info.Format = "tsv"
	}
	var preamble []string
	for i := 0; i < skip; i++ {
		l, err := br.ReadString('\n')
		if l != "" {
			preamble = append(preamble, fmt.Sprintf("%q", clip(strings.TrimRight(l, "\r\n"), 60)))
		}
		if err != nil {
			break
		}
	}
	cr := csv.NewReader(br)
	cr.Comma = delim
	cr.FieldsPerRecord = -1
	cr.LazyQuotes = opt.LazyQuotes
	cr.TrimLeadingSpace = spaced
	cr.ReuseRecord = false
	hdr, err := cr.Read()
	if err == io.EOF {
		return nil, &PosError{File: name, Err: ErrEmpty}
	}
	if err != nil {
		return nil, csvErr(name, err, skip)
	}
	t.header, t.notes = uniqueHeader(name, hdr)
	if skip > 0 {
		t.notes = append([]string{fmt.Sprintf("%s: the header is on line %d; the %s before it were skipped: %s", name, skip+1,
			count(skip, "line", "lines"), strings.Join(preamble, ", "))}, t.notes...)
	}
	if spaced {
		t.notes = append(t.notes, fmt.Sprintf("%s: fields separated by \", \" (comma and space); leading spaces of fields are dropped", name))
	}
	if delim == singleColumn {
		t.notes = append(t.notes, fmt.Sprintf("%s: the header has no separator; read as a single column", name))
	}
	blank, trailing, quoting := 0, 0, 0
	for i := 0; ; i++ {
		if i&1023 == 0 {
			if err := ctx.Err(); err != nil {
				return nil, err
			}
		}
		rec, err := cr.Read()
		if err == io.EOF {
			break
		}
		if err != nil {
			var pe *csv.ParseError
			if !errors.As(err, &pe) {
				return nil, &PosError{File: name, Err: err}
			}
			if _, err2 := br.Peek(1); err2 == io.EOF && errors.Is(err, csv.ErrQuote) && pe.Column > tail.lastLine() {
				return nil, &PosError{File: name, Line: pe.Line + skip, Column: pe.Column,
					Err: fmt.Errorf("%w: the quoted field of the record starting at line %d never closes", ErrUnclosedQuote, pe.StartLine+skip)}
			}
			d := fmt.Sprintf("%d:%d: %v", pe.Line+skip, pe.Column, pe.Err)
			if pe.Line != pe.StartLine {
				d = fmt.Sprintf("record on lines %d-%d, at %s", pe.StartLine+skip, pe.Line+skip, d)
			}
			t.rejects = append(t.rejects, Reject{File: name, Line: pe.StartLine + skip, Reason: ReasonBadQuoting, Detail: d})
			quoting++
			continue
		}
		line, _ := cr.FieldPos(0)
		line += skip
		if dec.sanitize {
			if bad := invalidField(rec); bad >= 0 && opt.RejectBadEncoding {
				if t.rejFields == nil {
					t.rejFields = map[int][]string{}
				}
				t.rejFields[len(t.rejects)] = rec
				t.rejects = append(t.rejects, Reject{File: name, Line: line, Reason: ReasonBadEncoding, Detail: fmt.Sprintf("field %d holds bytes that are not valid UTF-8", bad+1)})
				continue
			}
			for j := range rec {
				rec[j] = strings.ToValidUTF8(rec[j], "\uFFFD")
			}
		}
		if len(rec) > len(t.header) && allBlank(rec[len(t.header):]) {
			// A trailing delimiter (or several) with nothing after it: no data is lost.
			rec = rec[:len(t.header)]
			trailing++
		}
		if len(rec) != len(t.header) {
			if len(rec) == 1 && strings.TrimSpace(rec[0]) == "" {
				// A line of only blanks is no record (encoding/csv skips empty lines alike).
				blank++
				continue
			}
			if t.rejFields == nil {
				t.rejFields = map[int][]string{}
			}
			t.rejFields[len(t.rejects)] = rec
			t.rejects = append(t.rejects, Reject{File: name, Line: line, Reason: ReasonRaggedRow,
				Detail: fmt.Sprintf("%d fields, header has %d", len(rec), len(t.header))})
			continue
		}
		if sameHeader(rec, hdr) {
			// Files joined end to end repeat their header.
			t.rejects = append(t.rejects, Reject{File: name, Line: line, Reason: ReasonRepeatedHeader, Detail: "the row repeats the header"})
			continue
		}
		if err := t.keep(rawRow{line: line, f: rec}); err != nil {
			return nil, err
		}
	}
	if trailing > 0 {
		t.notes = append(t.notes, fmt.Sprintf("%s: %s empty fields after the header's last column; dropped them", name, count(trailing, "row ends in", "rows end in")))
	}
	if quoting > 0 && !opt.LazyQuotes {
		t.notes = append(t.notes, fmt.Sprintf("%s: %s bad quoting (RFC 4180); the lazy-quotes option reads such rows leniently", name, count(quoting, "row was rejected for", "rows were rejected for")))
	}
	if blank > 0 {
		t.notes = append(t.notes, fmt.Sprintf("%s: %d lines hold only spaces; not counted as rows", name, blank))
	}
	if t.read() == 0 {
		return nil, &PosError{File: name, Line: skip + 1, Err: ErrHeaderOnly}
	}
	t.info.Rows = t.read()
	return t, nil
}

func csvErr(name string, err error, skip int) error {
	var pe *csv.ParseError
	if errors.As(err, &pe) {
		return &PosError{File: name, Line: pe.Line + skip, Column: pe.Column, Err: pe.Err}
	}
	return &PosError{File: name, Err: err}
}

// clip shortens s to at most n bytes on a rune boundary, adding "..." when cut.
func clip(s string, n int) string {
	if len(s) <= n {
		return s
	}
	for n > 0 && n < len(s) && s[n]&0xC0 == 0x80 {
		n--
	}
	return s[:n] + "..."
}

// invalidField returns the index of the first field that is not valid UTF-8, or -1.
func invalidField(f []string) int {
	for i, v := range f {
		if !utf8.ValidString(v) {
			return i
		}
	}
	return -1
}

// sameHeader reports whether a row holds the header's names (ignoring surrounding blanks).
func sameHeader(rec, hdr []string) bool {
	if len(rec) != len(hdr) {
		return false
	}
	for i := range rec {
		if strings.TrimSpace(rec[i]) != strings.TrimSpace(hdr[i]) {
			return false
		}
	}
	return true
}
