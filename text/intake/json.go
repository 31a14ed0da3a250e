package intake

import (
	"bufio"
	"bytes"
	"context"
	"encoding/json"
	"errors"
	"fmt"
	"io"
	"strings"
)

// lineCounter passes bytes through and remembers where lines start, so that a byte
// offset of the JSON decoder can be turned into a line and column. Offsets must be asked
// in increasing order; older line starts are dropped. It also keeps the bytes from the
// last mark on, so that a syntax error inside one array element can be located exactly
// (encoding/json's Decoder reports offsets that are not positions in the stream).
type lineCounter struct {
	r      io.Reader
	off    int64
	starts []int64 // offsets of line starts not yet passed
	base   int     // line number of the line before starts[0]
	cur    int64   // offset of the start of line base+1
	kept   []byte  // the bytes from keptAt on
	keptAt int64
}

func (c *lineCounter) Read(p []byte) (int, error) {
	n, err := c.r.Read(p)
	for i, b := range p[:n] {
		if b == '\n' {
			c.starts = append(c.starts, c.off+int64(i)+1)
		}
	}
	c.kept = append(c.kept, p[:n]...)
	c.off += int64(n)
	return n, err
}

// mark lets the kept bytes before offset off go. They are dropped only once they are at
// least half of what is kept, so each byte is moved at most about once however small the
// elements are (the decoder reads ahead of the element being decoded).
func (c *lineCounter) mark(off int64) {
	if d := off - c.keptAt; d > 0 && d <= int64(len(c.kept)) && 2*d >= int64(len(c.kept)) {
		c.kept = c.kept[:copy(c.kept, c.kept[d:])]
		c.keptAt = off
	}
}

// since returns the kept bytes from offset off on (nil if they were dropped).
func (c *lineCounter) since(off int64) []byte {
	if off < c.keptAt || off-c.keptAt > int64(len(c.kept)) {
		return nil
	}
	return c.kept[off-c.keptAt:]
}

// lineAt returns the 1-based line holding byte offset off.
func (c *lineCounter) lineAt(off int64) int {
	l, _ := c.lineCol(off)
	return l
}

// lineCol returns the 1-based line and byte column of the byte at offset off.
func (c *lineCounter) lineCol(off int64) (int, int) {
	i := 0
	for i < len(c.starts) && c.starts[i] <= off {
		c.cur = c.starts[i]
		i++
	}
	c.base += i
	c.starts = c.starts[i:]
	return c.base + 1, int(off-c.cur) + 1
}

// readJSON reads a JSON array of objects (array true) or JSON Lines (one object a
// line; blank lines are skipped). Keys become columns in the order first seen; a
// string value is kept as is, null as "", numbers and booleans as their JSON text,
// and nested arrays or objects as compact JSON text. An element that is not an object
// is rejected ("bad json"); a syntax error in JSON Lines rejects that line and reading
// goes on, while in an array it is an error, as the rest cannot be trusted.
func (ps *pass) readJSON(ctx context.Context, name string, br *bufio.Reader, array bool, dec decision, opt *Options) (*table, error) {
	t := ps.table(FileInfo{Path: name, Format: "jsonl"})
	col := map[string]int{}
	// add takes one object. Its row holds the columns seen so far; rows are padded to
	// the whole header at the end (when kept) or by the pass's consumer (when emitted).
	add := func(line int, obj []kv) error {
		f := make([]string, len(t.header))
		for _, p := range obj {
			j, ok := col[p.k]
			if !ok {
				j = len(t.header)
				col[p.k] = j
				t.header = append(t.header, p.k)
				f = append(f, "")
			}
			f[j] = p.v
		}
		if dec.sanitize {
			if bad := invalidField(f); bad >= 0 && opt.RejectBadEncoding {
				t.rejects = append(t.rejects, Reject{File: name, Line: line, Reason: ReasonBadEncoding,
					Detail: fmt.Sprintf("value of %q holds bytes that are not valid UTF-8", t.header[bad])})
				return nil
			}
			for j, v := range f {
				f[j] = strings.ToValidUTF8(v, "\uFFFD")
			}
		}
		return t.keep(rawRow{line: line, f: f})
	}
	if array {
		t.info.Format = "json"
		lc := &lineCounter{r: br}
		d := json.NewDecoder(lc)
		d.UseNumber()
		tok, err := d.Token()
		if err != nil {
			return nil, jsonErr(name, lc, d, err)
		}
		elements := func() error {
			for i := 0; d.More(); i++ {
				if i&1023 == 0 {
					if err := ctx.Err(); err != nil {
						return err
					}
				}
				var raw json.RawMessage
				from := d.InputOffset()
				lc.mark(from)
				if err := d.Decode(&raw); err != nil {
					return elementErr(name, lc, d, err, from)
				}
				line := lc.lineAt(d.InputOffset() - int64(len(raw)))
				obj, err := object(raw)
				if err != nil {
					t.rejects = append(t.rejects, Reject{File: name, Line: line, Reason: ReasonBadJSON, Detail: err.Error()})
					continue
				}
				if err := add(line, obj); err != nil {
					return err
				}
			}
			if _, err := d.Token(); err != nil { // the closing ]
				return jsonErr(name, lc, d, err)
			}
			return nil
		}
		if tok == json.Delim('[') {
			if err := elements(); err != nil {
				return nil, err
			}
		} else {
			// One object wrapping the records: {"meta": {...}, "records": [{...}, ...]}.
			// The first key whose value is an array is read as the records.
			key := ""
			for d.More() {
				kt, err := d.Token()
				if err != nil {
					return nil, jsonErr(name, lc, d, err)
				}
				k, _ := kt.(string)
				if key == "" && nextValueByte(d) == '[' {
					if _, err := d.Token(); err != nil {
						return nil, jsonErr(name, lc, d, err)
					}
					key = k
					if err := elements(); err != nil {
						return nil, err
					}
					continue
				}
				var skip json.RawMessage
				if err := d.Decode(&skip); err != nil {
					return nil, jsonErr(name, lc, d, err)
				}
			}
			if _, err := d.Token(); err != nil {
				return nil, jsonErr(name, lc, d, err)
			}
			if key == "" {
				return nil, &PosError{File: name, Line: 1, Err: errors.New("a JSON object that is neither one object per line nor holds an array of records")}
			}
			t.notes = append(t.notes, fmt.Sprintf("%s: records read from the array under the key %q", name, key))
		}
		if _, err := d.Token(); err != io.EOF {
			return nil, &PosError{File: name, Line: lc.lineAt(d.InputOffset()), Err: errors.New("data after the end of the JSON value")}
		}
	} else {
		line := 0
		for {
			b, err := br.ReadBytes('\n')
			if len(b) > 0 {
				line++
				if line&1023 == 0 {
					if err := ctx.Err(); err != nil {
						return nil, err
					}
				}
				b = bytes.TrimSpace(b)
				if len(b) > 0 {
					obj, perr := object(b)
					if perr != nil {
						t.rejects = append(t.rejects, Reject{File: name, Line: line, Reason: ReasonBadJSON, Detail: perr.Error()})
					} else if err := add(line, obj); err != nil {
						return nil, err
					}
				}
			}
			if err == io.EOF {
				break
			}
			if err != nil {
				return nil, &PosError{File: name, Line: line, Err: err}
			}
		}
	}
	for i := range t.rows {
		t.rows[i].f = pad(t.rows[i].f, len(t.header))
	}
	if t.read() == 0 {
		return nil, &PosError{File: name, Err: errors.New("no JSON objects")}
	}
	t.info.Rows = t.read()
	return t, nil
}

// elementErr is jsonErr for an error while decoding the array element that starts after
// offset from (after white space and a comma): a syntax error is located by scanning
// the element's bytes again with json.Unmarshal, whose offsets are positions in its input,
// so the error names the line and column of the offending byte.
func elementErr(name string, lc *lineCounter, d *json.Decoder, err error, from int64) error {
	var se *json.SyntaxError
	if !errors.As(err, &se) {
		return jsonErr(name, lc, d, err)
	}
	b := lc.since(from)
	skip := 0
	for skip < len(b) && (b[skip] == ' ' || b[skip] == '\t' || b[skip] == '\r' || b[skip] == '\n') {
		skip++
	}
	if skip < len(b) && b[skip] == ',' {
		skip++
	}
	var raw json.RawMessage
	var se2 *json.SyntaxError
	if uerr := json.Unmarshal(b[skip:], &raw); errors.As(uerr, &se2) && se2.Error() == se.Error() && se2.Offset > 0 && se2.Offset <= int64(len(b)-skip) {
		line, col := lc.lineCol(from + int64(skip) + se2.Offset - 1)
		return &PosError{File: name, Line: line, Column: col, Err: fmt.Errorf("bad JSON: %v", se2)}
	}
	return jsonErr(name, lc, d, err)
}

func jsonErr(name string, lc *lineCounter, d *json.Decoder, err error) error {
	var se *json.SyntaxError
	if errors.As(err, &se) {
		return &PosError{File: name, Line: lc.lineAt(se.Offset), Err: fmt.Errorf("bad JSON: %v", err)}
	}
	if err == io.EOF || errors.Is(err, io.ErrUnexpectedEOF) {
		return &PosError{File: name, Err: errors.New("bad JSON: unexpected end of file")}
	}
	return &PosError{File: name, Line: lc.lineAt(d.InputOffset()), Err: fmt.Errorf("bad JSON: %v", err)}
}

type kv struct{ k, v string }

// object reads one JSON object, keeping its keys in order.
func object(raw []byte) ([]kv, error) {
	d := json.NewDecoder(bytes.NewReader(raw))
	d.UseNumber()
	tok, err := d.Token()
	if err != nil {
		return nil, fmt.Errorf("not JSON: %v", err)
	}
	if tok != json.Delim('{') {
		return nil, fmt.Errorf("a JSON %s, not an object", kind(tok))
	}
	var out []kv
	for d.More() {
		kt, err := d.Token()
		if err != nil {
			return nil, err
		}
		k, _ := kt.(string)
		var v json.RawMessage
		if err := d.Decode(&v); err != nil {
			return nil, err
		}
		out = append(out, kv{k, scalar(v)})
	}
	if _, err := d.Token(); err != nil {
		return nil, err
	}
	if _, err := d.Token(); err != io.EOF {
		return nil, errors.New("data after the object")
	}
	return out, nil
}

func kind(tok json.Token) string {
	switch tok.(type) {
	case json.Delim:
		return "array"
	case string:
		return "string"
	case json.Number:
		return "number"
	case bool:
		return "boolean"
	}
	return "null"
}

func scalar(v json.RawMessage) string {
	switch {
	case len(v) == 0 || string(v) == "null":
		return ""
	case v[0] == '"':
		var s string
		if json.Unmarshal(v, &s) == nil {
			return s
		}
	case v[0] == '{' || v[0] == '[':
		var b bytes.Buffer
		if json.Compact(&b, v) == nil {
			return b.String()
		}
	}
	return string(v)
}

// nextValueByte returns the first byte of the value the decoder reads next (after the
// ':' of a key), or 0 when it is not yet buffered.
func nextValueByte(d *json.Decoder) byte {
	var buf [256]byte
	n, _ := d.Buffered().Read(buf[:])
	for _, c := range buf[:n] {
		switch c {
		case ' ', '\t', '\r', '\n', ':':
			continue
		}
		return c
	}
	return 0
}

// pad extends f with empty fields to n.
func pad(f []string, n int) []string {
	for len(f) < n {
		f = append(f, "")
	}
	return f
}
