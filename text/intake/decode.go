package intake

import (
	"bytes"
	"fmt"
	"io"
	"unicode/utf8"

	"golang.org/x/text/encoding/charmap"
	"golang.org/x/text/encoding/unicode"
	"golang.org/x/text/transform"
)

// Encoding names reported in FileInfo.Encoding.
const (
	EncUTF8        = "utf-8"
	EncUTF8BOM     = "utf-8 with BOM"
	EncUTF16LE     = "utf-16le"
	EncUTF16BE     = "utf-16be"
	EncWindows1252 = "windows-1252"
)

// byteScan is the result of one streaming pass over a file's raw bytes.
type byteScan struct {
	size         int64
	lines        int   // physical lines ('\n' count, plus one for a final unterminated line)
	invalidLines int   // lines with bytes that are not valid UTF-8
	utf8Lines    int   // lines with valid multi-byte UTF-8 and no invalid bytes
	firstNUL     int64 // offset of the first NUL byte, -1 if none
	nulLine      int   // its 1-based line and byte column
	nulCol       int
}

// scanBytes reads r once in chunks and classifies every line as ASCII, valid UTF-8 or
// invalid UTF-8. A sequence cut by a chunk boundary is carried to the next chunk.
func scanBytes(r io.Reader) (byteScan, error) {
	s := byteScan{firstNUL: -1}
	buf := make([]byte, 64<<10)
	var carry []byte
	var lineBad, lineMB, lineAny bool
	var off, lineStart int64
	for {
		n, err := r.Read(buf)
		chunk := buf[:n]
		if len(carry) > 0 {
			chunk = append(carry, chunk...)
			carry = nil
		}
		i := 0
		for i < len(chunk) {
			c := chunk[i]
			if c < utf8.RuneSelf {
				if c == 0 && s.firstNUL < 0 {
					s.firstNUL = off + int64(i)
					s.nulLine, s.nulCol = s.lines+1, int(s.firstNUL-lineStart)+1
				}
				if c == '\n' {
					lineStart = off + int64(i) + 1
					s.tally(lineBad, lineMB)
					lineBad, lineMB, lineAny = false, false, false
				} else {
					lineAny = true
				}
				i++
				continue
			}
			lineAny = true
			if !utf8.FullRune(chunk[i:]) && err == nil {
				carry = append([]byte(nil), chunk[i:]...)
				break
			}
			rn, w := utf8.DecodeRune(chunk[i:])
			if rn == utf8.RuneError && w == 1 {
				lineBad = true
			} else {
				lineMB = true
			}
			i += w
		}
		off += int64(i)
		if err == io.EOF {
			break
		}
		if err != nil {
			return s, err
		}
	}
	if lineAny {
		s.tally(lineBad, lineMB)
	}
	s.size = off
	return s, nil
}

func (s *byteScan) tally(bad, mb bool) {
	s.lines++
	switch {
	case bad:
		s.invalidLines++
	case mb:
		s.utf8Lines++
	}
}

// decision is how a file's bytes are turned into UTF-8 text.
type decision struct {
	encoding     string
	skip         int64 // bytes of BOM to skip
	invalidLines int   // lines not valid in the chosen encoding
	sanitize     bool  // replace invalid UTF-8 with U+FFFD after decoding
	note         string
}

// decideEncoding chooses the encoding of one file. Rules, in order:
//
//	a byte-order mark decides (UTF-8, UTF-16 LE, UTF-16 BE);
//	a NUL byte without a UTF-16 BOM means binary content (error);
//	no invalid UTF-8 sequence means UTF-8;
//	otherwise the majority decides: if more lines hold invalid UTF-8 than hold valid
//	multi-byte UTF-8, the file is Windows-1252 (every byte is then a character; the
//	UTF-8 lines come out as mojibake and are counted as invalid); else the file is UTF-8
//	and the bytes of the invalid lines are replaced by U+FFFD and counted.
func decideEncoding(name string, head []byte, sc func() (byteScan, error)) (decision, error) {
	switch {
	case bytes.HasPrefix(head, []byte{0xEF, 0xBB, 0xBF}):
		d := decision{encoding: EncUTF8BOM, skip: 3}
		s, err := sc()
		if err != nil {
			return d, err
		}
		if s.invalidLines > 0 {
			d.sanitize, d.invalidLines = true, s.invalidLines
			d.note = fmt.Sprintf("%s: %d lines hold bytes that are not valid UTF-8; replaced by U+FFFD", name, s.invalidLines)
		}
		return d, nil
	case bytes.HasPrefix(head, []byte{0xFF, 0xFE}):
		return decision{encoding: EncUTF16LE}, nil
	case bytes.HasPrefix(head, []byte{0xFE, 0xFF}):
		return decision{encoding: EncUTF16BE}, nil
	}
	s, err := sc()
	if err != nil {
		return decision{}, err
	}
	if s.firstNUL >= 0 {
		return decision{}, &PosError{File: name, Line: s.nulLine, Column: s.nulCol, Err: fmt.Errorf("%w (NUL byte at offset %d)", ErrBinary, s.firstNUL)}
	}
	if s.invalidLines == 0 {
		return decision{encoding: EncUTF8}, nil
	}
	if s.invalidLines > s.utf8Lines {
		d := decision{encoding: EncWindows1252, invalidLines: s.utf8Lines}
		d.note = fmt.Sprintf("%s: not valid UTF-8 (%d of %d lines), read as Windows-1252", name, s.invalidLines, s.lines)
		if s.utf8Lines > 0 {
			d.note += fmt.Sprintf("; %d lines looked like UTF-8 and may show mojibake", s.utf8Lines)
		}
		return d, nil
	}
	d := decision{encoding: EncUTF8, sanitize: true, invalidLines: s.invalidLines}
	d.note = fmt.Sprintf("%s: mixed encodings; read as UTF-8 (%d lines), %d lines hold invalid bytes, replaced by U+FFFD", name, s.utf8Lines, s.invalidLines)
	return d, nil
}

// decodedReader returns the UTF-8 text of r under decision d.
func decodedReader(r io.ReaderAt, size int64, d decision) io.Reader {
	sr := io.NewSectionReader(r, d.skip, size-d.skip)
	switch d.encoding {
	case EncUTF16LE:
		return transform.NewReader(sr, unicode.UTF16(unicode.LittleEndian, unicode.ExpectBOM).NewDecoder())
	case EncUTF16BE:
		return transform.NewReader(sr, unicode.UTF16(unicode.BigEndian, unicode.ExpectBOM).NewDecoder())
	case EncWindows1252:
		return transform.NewReader(sr, charmap.Windows1252.NewDecoder())
	}
	return sr
}
