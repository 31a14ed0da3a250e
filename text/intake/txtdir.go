package intake

import (
	"bytes"
	"context"
	"fmt"
	"io"
	"os"
	"path/filepath"
	"regexp"
	"sort"
	"strings"
	"unicode/utf8"
)

var reDateLine = regexp.MustCompile(`^(?i:date)\s*:\s*(.*)$`)

// readTextDir reads a folder of .txt files, one narrative each, in file-name order
// (byte order; sub-folders are not entered). The columns are "id" (the file name without
// its extension), "date" and "text". When a file's first line is "Date: <value>", the
// value is its date and the line is not part of the narrative; otherwise the date is
// empty. Each file's encoding is decided on its own; FileInfo.Encoding counts them.
func (ps *pass) readTextDir(ctx context.Context, dir string, opt *Options) (*table, error) {
	ents, err := os.ReadDir(dir)
	if err != nil {
		return nil, err
	}
	var names []string
	skipped := 0
	for _, e := range ents {
		if e.IsDir() {
			continue
		}
		if strings.EqualFold(filepath.Ext(e.Name()), ".txt") {
			names = append(names, e.Name())
		} else {
			skipped++
		}
	}
	sort.Strings(names)
	t := ps.table(FileInfo{Path: dir, Format: "txt"})
	t.header = []string{"id", "date", "text"}
	if skipped > 0 {
		t.notes = append(t.notes, fmt.Sprintf("%s: %d files without the .txt extension were not read", dir, skipped))
	}
	encs := map[string]int{}
	for _, n := range names {
		if err := ctx.Err(); err != nil {
			return nil, err
		}
		p := filepath.Join(dir, n)
		b, err := os.ReadFile(p)
		if err != nil {
			return nil, err
		}
		id := strings.TrimSuffix(n, filepath.Ext(n))
		if len(b) == 0 {
			encs[EncUTF8]++
			if err := t.keep(rawRow{line: 1, f: []string{id, "", ""}, file: p}); err != nil {
				return nil, err
			}
			continue
		}
		dec, err := ps.decide(p, b, func() (byteScan, error) { return scanBytes(bytes.NewReader(b)) })
		if err != nil {
			return nil, err
		}
		encs[dec.encoding]++
		t.info.InvalidLines += dec.invalidLines
		if dec.note != "" {
			t.notes = append(t.notes, dec.note)
		}
		tb, err := io.ReadAll(decodedReader(bytes.NewReader(b), int64(len(b)), dec))
		if err != nil {
			return nil, &PosError{File: p, Err: err}
		}
		text := string(tb)
		if dec.sanitize && opt.RejectBadEncoding && !utf8.ValidString(text) {
			t.rejects = append(t.rejects, Reject{File: p, Line: 1, ID: id, Reason: ReasonBadEncoding,
				Detail: fmt.Sprintf("%d lines hold bytes that are not valid UTF-8", dec.invalidLines)})
			continue
		}
		if dec.sanitize {
			text = strings.ToValidUTF8(text, "\uFFFD")
		}
		date := ""
		first, rest, _ := strings.Cut(text, "\n")
		if m := reDateLine.FindStringSubmatch(strings.TrimRight(first, "\r")); m != nil {
			date, text = strings.TrimSpace(m[1]), rest
		}
		if err := t.keep(rawRow{line: 1, f: []string{id, date, text}, file: p}); err != nil {
			return nil, err
		}
	}
	if t.read() == 0 {
		return nil, &PosError{File: dir, Err: fmt.Errorf("%w: no .txt files in the folder", ErrEmpty)}
	}
	var keys []string
	for k := range encs {
		keys = append(keys, k)
	}
	sort.Strings(keys)
	if len(keys) == 1 {
		t.info.Encoding = keys[0]
	} else {
		parts := make([]string, len(keys))
		for i, k := range keys {
			parts[i] = fmt.Sprintf("%s %d", k, encs[k])
		}
		t.info.Encoding = "mixed: " + strings.Join(parts, ", ")
	}
	t.info.Rows = t.read()
	return t, nil
}
