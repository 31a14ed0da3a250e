package intake

import (
	"archive/zip"
	"bufio"
	"bytes"
	"compress/gzip"
	"context"
	"encoding/json"
	"fmt"
	"io"
	"os"
	"path/filepath"
	"strings"
)

// table is one input file read into rows of strings, before columns are chosen.
type table struct {
	info    FileInfo
	header  []string
	rows    []rawRow
	rejects []Reject // rows rejected while parsing (ragged, bad quoting, bad json)
	// rejFields holds the fields of rejected rows by index in rejects, so that their id
	// can be taken from the id column once it is known.
	rejFields map[int][]string
	notes     []string
	xlsx      bool
	// nrows counts the rows parsed and not rejected; with emit set they are handed to
	// emit as they are parsed and not kept in rows.
	nrows int
	emit  func(t *table, r rawRow) error
}

type rawRow struct {
	line int
	f    []string
	file string // the file of the row when it differs from the table's (a .txt folder)
}

func (t *table) read() int { return t.nrows + len(t.rejects) }

// keep takes a parsed row: into rows, or to emit when the table streams.
func (t *table) keep(r rawRow) error {
	t.nrows++
	if t.emit != nil {
		return t.emit(t, r)
	}
	t.rows = append(t.rows, r)
	return nil
}

// pass is one reading of the inputs: where the rows go, and what an earlier reading of
// the same inputs learned (encodings; spooled standard input and decompressed gzip files,
// kept on disk until cleanup). The zero pass keeps rows in their tables.
type pass struct {
	emit  func(t *table, r rawRow) error
	known map[string]decision
	spool map[string]spooled
}

type spooled struct {
	f    *os.File
	size int64
}

func (ps *pass) table(info FileInfo) *table {
	t := &table{info: info}
	if ps != nil {
		t.emit = ps.emit
	}
	return t
}

// spooled returns the temporary copy made for name, making it with fill on first use.
func (ps *pass) spooledFile(name string, fill func(f *os.File) (int64, error)) (*os.File, int64, error) {
	if sp, ok := ps.spool[name]; ok {
		return sp.f, sp.size, nil
	}
	f, err := os.CreateTemp("", "undercurrent-spool-*")
	if err != nil {
		return nil, 0, err
	}
	n, err := fill(f)
	if err != nil {
		f.Close()
		os.Remove(f.Name())
		return nil, 0, err
	}
	if ps.spool == nil {
		ps.spool = map[string]spooled{}
	}
	ps.spool[name] = spooled{f, n}
	return f, n, nil
}

// cleanup removes the temporary files.
func (ps *pass) cleanup() {
	for _, sp := range ps.spool {
		sp.f.Close()
		os.Remove(sp.f.Name())
	}
	ps.spool = nil
}

// decide is decideEncoding, remembered by file name for later passes.
func (ps *pass) decide(name string, head []byte, sc func() (byteScan, error)) (decision, error) {
	if d, ok := ps.known[name]; ok {
		return d, nil
	}
	d, err := decideEncoding(name, head, sc)
	if err == nil {
		if ps.known == nil {
			ps.known = map[string]decision{}
		}
		ps.known[name] = d
	}
	return d, err
}

// readSource reads one file whose bytes are r[0:size]; name is used in messages.
func readSource(ctx context.Context, name string, r io.ReaderAt, size int64, opt *Options) (*table, error) {
	ps := &pass{}
	defer ps.cleanup()
	return ps.readSource(ctx, name, r, size, opt)
}

func (ps *pass) readSource(ctx context.Context, name string, r io.ReaderAt, size int64, opt *Options) (*table, error) {
	if size == 0 {
		return nil, &PosError{File: name, Err: ErrEmpty}
	}
	head := make([]byte, 8)
	n, _ := r.ReadAt(head, 0)
	head = head[:n]
	switch {
	case bytes.HasPrefix(head, []byte("PK\x03\x04")):
		zr, err := zip.NewReader(r, size)
		if err != nil {
			return nil, &PosError{File: name, Err: fmt.Errorf("%w: zip archive that cannot be opened: %v", ErrBinary, err)}
		}
		for _, f := range zr.File {
			if strings.HasPrefix(f.Name, "xl/") {
				return ps.readXLSX(ctx, name, io.NewSectionReader(r, 0, size), opt)
			}
		}
		return nil, &PosError{File: name, Err: fmt.Errorf("%w: zip archive that is not an Excel workbook (no xl/ inside)", ErrBinary)}
	case bytes.HasPrefix(head, []byte{0x1F, 0x8B}):
		return ps.readGzip(ctx, name, io.NewSectionReader(r, 0, size), opt)
	case bytes.HasPrefix(head, []byte{0xD0, 0xCF, 0x11, 0xE0, 0xA1, 0xB1, 0x1A, 0xE1}):
		return nil, &PosError{File: name, Err: fmt.Errorf("%w: legacy Excel .xls (or other OLE2) file; save it as .xlsx or CSV", ErrBinary)}
	}
	dec, err := ps.decide(name, head, func() (byteScan, error) {
		return scanBytes(io.NewSectionReader(r, 0, size))
	})
	if err != nil {
		return nil, err
	}
	tail := &tailTracker{r: decodedReader(r, size, dec)}
	br := bufio.NewReaderSize(tail, 64<<10)
	peek, _ := br.Peek(64 << 10)
	if len(peek) < 64<<10 && len(bytes.TrimSpace(peek)) == 0 {
		return nil, &PosError{File: name, Err: ErrEmpty}
	}
	var notes []string
	if len(peek) > 0 && bytes.IndexByte(peek, '\n') < 0 && bytes.IndexByte(peek, '\r') >= 0 {
		// Lines end in a bare CR (classic Mac OS): read each CR as a line end.
		br = bufio.NewReaderSize(crReader{br}, 64<<10)
		peek, _ = br.Peek(64 << 10)
		notes = append(notes, name+": lines end in a carriage return alone; read as line ends")
	}
	var t *table
	ext := filepath.Ext(strings.TrimSuffix(strings.ToLower(name), ".gz"))
	first := firstNonSpace(peek)
	if ext != ".csv" && ext != ".tsv" && (first == '[' || first == '{') {
		// '[': an array of objects. '{': JSON Lines when the first line is a whole
		// object, else one object wrapping an array of records.
		line, _, _ := bytes.Cut(bytes.TrimLeft(peek, " \t\r\n"), []byte("\n"))
		array := first == '[' || !json.Valid(bytes.TrimSpace(line))
		t, err = ps.readJSON(ctx, name, br, array, dec, opt)
	} else {
		t, err = ps.readCSV(ctx, name, br, peek, ext, dec, tail, opt)
	}
	if err != nil {
		return nil, err
	}
	t.info.Encoding = dec.encoding
	t.info.InvalidLines = dec.invalidLines
	if dec.note != "" {
		notes = append([]string{dec.note}, notes...)
	}
	t.notes = append(notes, t.notes...)
	return t, nil
}

func firstNonSpace(b []byte) byte {
	for _, c := range b {
		switch c {
		case ' ', '\t', '\r', '\n':
			continue
		}
		return c
	}
	return 0
}

// uniqueHeader trims header names, names empty ones "column N" and suffixes repeats
// " (2)", " (3)" ..., noting each change.
func uniqueHeader(name string, h []string) ([]string, []string) {
	var notes []string
	seen := map[string]int{}
	out := make([]string, len(h))
	for i, c := range h {
		c = strings.TrimSpace(c)
		if c == "" {
			c = fmt.Sprintf("column %d", i+1)
			notes = append(notes, fmt.Sprintf("%s: column %d has no name, called %q", name, i+1, c))
		}
		if n := seen[c]; n > 0 {
			nc := fmt.Sprintf("%s (%d)", c, n+1)
			notes = append(notes, fmt.Sprintf("%s: column %d repeats the name %q, called %q", name, i+1, c, nc))
			seen[c]++
			c = nc
		}
		seen[c]++
		out[i] = c
	}
	return out, notes
}

// crReader turns every '\r' into '\n'.
type crReader struct{ r io.Reader }

func (c crReader) Read(p []byte) (int, error) {
	n, err := c.r.Read(p)
	for i, b := range p[:n] {
		if b == '\r' {
			p[i] = '\n'
		}
	}
	return n, err
}

// tailTracker passes bytes through and keeps the byte length of the last line seen
// (CR, LF and CRLF end lines), so that an error at the end of a file can tell a quote
// that never closed (its column lies past the end of the last line) from other quoting
// errors on the last line.
type tailTracker struct {
	r             io.Reader
	cur, prev     int
	sawCR, anyEOL bool
}

func (t *tailTracker) Read(p []byte) (int, error) {
	n, err := t.r.Read(p)
	for _, b := range p[:n] {
		switch {
		case b == '\r':
			t.prev, t.cur, t.sawCR = t.cur, 0, true
		case b == '\n' && t.sawCR:
			t.sawCR = false
		case b == '\n':
			t.prev, t.cur = t.cur, 0
		default:
			t.sawCR = false
			t.cur++
		}
	}
	return n, err
}

// lastLine is the length of the file's last line, without its line end.
func (t *tailTracker) lastLine() int {
	if t.cur > 0 {
		return t.cur
	}
	return t.prev
}

// readGzip decompresses a gzip file (RFC 1952; magic 1F 8B) into a temporary file and
// reads that. Line numbers are those of the decompressed text.
func (ps *pass) readGzip(ctx context.Context, name string, r io.Reader, opt *Options) (*table, error) {
	f, n, err := ps.spooledFile("gzip:"+name, func(f *os.File) (int64, error) {
		zr, err := gzip.NewReader(r)
		if err != nil {
			return 0, &PosError{File: name, Err: fmt.Errorf("%w: damaged gzip file: %v", ErrBinary, err)}
		}
		n, err := io.Copy(f, zr)
		if err != nil {
			return 0, &PosError{File: name, Err: fmt.Errorf("%w: damaged gzip file: %v", ErrBinary, err)}
		}
		return n, nil
	})
	if err != nil {
		return nil, err
	}
	if n >= 2 {
		var h [2]byte
		if _, err := f.ReadAt(h[:], 0); err == nil && h == [2]byte{0x1F, 0x8B} {
			return nil, &PosError{File: name, Err: fmt.Errorf("%w: gzip inside gzip", ErrBinary)}
		}
	}
	t, err := ps.readSource(ctx, name, f, n, opt)
	if err != nil {
		return nil, err
	}
	t.notes = append([]string{name + ": gzip-compressed; read decompressed"}, t.notes...)
	return t, nil
}
