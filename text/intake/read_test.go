package intake

import (
	"bytes"
	"compress/gzip"
	"context"
	"encoding/json"
	"errors"
	"os"
	"path/filepath"
	"reflect"
	"slices"
	"strings"
	"testing"
	"time"

	"github.com/xuri/excelize/v2"
)

// writeFile writes content to name in a fresh temporary folder and returns its path.
func writeFile(t *testing.T, name string, content []byte) string {
	t.Helper()
	p := filepath.Join(t.TempDir(), name)
	if err := os.WriteFile(p, content, 0o644); err != nil {
		t.Fatal(err)
	}
	return p
}

func readOne(t *testing.T, name, content string, opt Options) (*Set, error) {
	t.Helper()
	if opt.Now.IsZero() {
		opt.Now = testNow
	}
	s, err := Read(context.Background(), []string{writeFile(t, name, []byte(content))}, nil, opt)
	if err == nil && len(s.Records)+len(s.Rejects) != s.Read {
		t.Fatalf("accounting: kept %d + rejected %d != read %d", len(s.Records), len(s.Rejects), s.Read)
	}
	return s, err
}

func texts(s *Set) []string {
	var out []string
	for _, r := range s.Records {
		out = append(out, r.Text)
	}
	return out
}

// TestRFC4180 reads the examples of RFC 4180 section 2, rules 1-7, each under a header
// "id,text,x" (rule 3 allows a header; our reader always takes one).
func TestRFC4180(t *testing.T) {
	hdr := "id,text,x\r\n"
	tests := []struct {
		rule  string
		in    string
		text  []string
		x     []string
		lines []int
	}{
		{"2.1 each record on its own line, CRLF", hdr + "aaa,bbb,ccc\r\nzzz,yyy,xxx\r\n", []string{"bbb", "yyy"}, []string{"ccc", "xxx"}, []int{2, 3}},
		{"2.2 last record without line break", hdr + "aaa,bbb,ccc\r\nzzz,yyy,xxx", []string{"bbb", "yyy"}, []string{"ccc", "xxx"}, []int{2, 3}},
		{"2.4 spaces are part of a field", hdr + "aaa,bbb, ccc \r\n", []string{"bbb"}, []string{" ccc "}, []int{2}},
		{"2.5 fields may be quoted", hdr + "\"aaa\",\"bbb\",\"ccc\"\r\nzzz,yyy,xxx\r\n", []string{"bbb", "yyy"}, []string{"ccc", "xxx"}, []int{2, 3}},
		{"2.6 line breaks, quotes and commas inside quotes", hdr + "\"aaa\",\"b\r\nbb\",\"c,cc\"\r\nzzz,yyy,xxx\r\n", []string{"b\nbb", "yyy"}, []string{"c,cc", "xxx"}, []int{2, 4}},
		{"2.7 a quote is escaped by another", hdr + "\"aaa\",\"b\"\"bb\",\"ccc\"\r\n", []string{"b\"bb"}, []string{"ccc"}, []int{2}},
	}
	for _, tt := range tests {
		t.Run(tt.rule, func(t *testing.T) {
			s, err := readOne(t, "rfc.csv", tt.in, Options{Text: []string{"text"}, ID: "id"})
			if err != nil {
				t.Fatal(err)
			}
			if got := texts(s); !reflect.DeepEqual(got, tt.text) {
				t.Errorf("texts %q, want %q", got, tt.text)
			}
			var xs []string
			var lines []int
			for _, r := range s.Records {
				xs = append(xs, r.Extra[0])
				lines = append(lines, r.Line)
			}
			if !reflect.DeepEqual(xs, tt.x) || !reflect.DeepEqual(lines, tt.lines) {
				t.Errorf("x %q lines %v, want %q %v", xs, lines, tt.x, tt.lines)
			}
		})
	}
}

func TestRFC4180HeaderRule3(t *testing.T) {
	// RFC 4180 2.3: the header "field_name,field_name,field_name"; repeated names are
	// made distinct and noted.
	s, err := readOne(t, "h.csv", "field_name,field_name,field_name\r\naaa,bbb,ccc\r\nzzz,yyy,xxx\r\n", Options{ID: "-", Text: []string{"field_name (2)"}})
	if err != nil {
		t.Fatal(err)
	}
	if !reflect.DeepEqual(s.ExtraNames, []string{"field_name", "field_name (3)"}) || !reflect.DeepEqual(texts(s), []string{"bbb", "yyy"}) {
		t.Errorf("extra %q texts %q", s.ExtraNames, texts(s))
	}
}

// TestDelimiters: the separators named in the brief; the ", " case copies the shape of
// shared/corpora/safenet (SOURCES.md: header and fields separated by ", ").
func TestDelimiters(t *testing.T) {
	tests := []struct{ name, in, want string }{
		{"a.csv", "id,narrative\n1,one\n2,two\n", ","},
		{"a.csv", "id;narrative\n1;one, two\n2;three\n", ";"},
		{"a.tsv", "id\tnarrative\n1\tone, two\n2\tthree\n", "\t"},
		{"a.txt", "id|narrative\n1|one; two\n2|three\n", "|"},
		// safenet: header and fields separated by ", " (SOURCES.md), rows by ",".
		{"a.csv", "\"ID\", \"Narrative\"\n\"1\",\"one\"\n\"2\",\"two\"\n", ", "},
	}
	for _, tt := range tests {
		s, err := readOne(t, tt.name, tt.in, Options{})
		if err != nil {
			t.Fatalf("%q: %v", tt.in, err)
		}
		if s.Files[0].Delimiter != tt.want || len(s.Records) != 2 || s.Records[1].Text == "" {
			t.Errorf("%q: delimiter %q, records %d %q; want %q", tt.in, s.Files[0].Delimiter, len(s.Records), texts(s), tt.want)
		}
	}
}

// TestBadInputs: issue 2's bad-input list (binary files, empty and header-only files, an
// unclosed quote); the zip magic PK\x03\x04 is from the ZIP format's APPNOTE (local file
// header signature) and D0 CF 11 E0 A1 B1 1A E1 is the OLE2 compound-file signature
// used by .xls (both from memory).
func TestBadInputs(t *testing.T) {
	tests := []struct {
		name, in string
		want     error
		pos      string
	}{
		{"empty.csv", "", ErrEmpty, "empty.csv: empty file"},
		{"blank.csv", "\n\n  \n", ErrEmpty, "blank.csv: empty file"},
		{"header.csv", "id,narrative\n", ErrHeaderOnly, "header.csv:1: header only"},
		{"unclosed.csv", "id,narrative\n1,\"never closed\n2,two\n", ErrUnclosedQuote, "unclosed.csv:3:7: unclosed quote: the quoted field of the record starting at line 2 never closes"},
		{"bin.csv", "id,narrative\n1,\x00\x01\x02\n", ErrBinary, "bin.csv:2:3: binary content, not a text export (NUL byte at offset 15)"},
		{"zip.csv", "PK\x03\x04garbage", ErrBinary, "zip.csv: binary content"},
		{"ole.xls", "\xD0\xCF\x11\xE0\xA1\xB1\x1A\xE1rest", ErrBinary, "ole.xls: binary content, not a text export: legacy Excel"},
	}
	for _, tt := range tests {
		_, err := readOne(t, tt.name, tt.in, Options{})
		var pe *PosError
		if !errors.Is(err, tt.want) || !errors.As(err, &pe) {
			t.Errorf("%s: err %v, want %v", tt.name, err, tt.want)
			continue
		}
		if !strings.Contains(err.Error(), tt.pos) || !strings.HasSuffix(pe.File, tt.name) {
			t.Errorf("%s: %q does not name %q", tt.name, err, tt.pos)
		}
	}
}

// TestRowRejects: one row per reason code of issue 2 item 5; expected values worked by
// hand from the documented rules (first failing check gives the reason).
func TestRowRejects(t *testing.T) {
	in := "id,date,narrative\n" +
		"1,2020-01-05,first\n" +
		"2,2020-01-06\n" + // ragged
		"3,2020-01-07,x\"y\n" + // bare quote
		"4,2020-01-08,   \n" + // empty narrative
		"5,soon,text five\n" + // unparseable date
		"6,1850-01-01,text six\n" + // implausible
		"7,2031-01-01,text seven\n" + // implausible (after now)
		"1,2020-01-09,first\n" + // duplicate id
		"1,2020-01-10,other\n" + // duplicate id, different text
		",,\n" + // blank row
		"8,,no date\n"
	s, err := readOne(t, "r.csv", in, Options{})
	if err != nil {
		t.Fatal(err)
	}
	type rj struct {
		line   int
		reason string
	}
	var got []rj
	for _, r := range s.Rejects {
		got = append(got, rj{r.Line, r.Reason})
	}
	want := []rj{{3, ReasonRaggedRow}, {4, ReasonBadQuoting}, {5, ReasonEmptyNarrative}, {6, ReasonUnparseableDate},
		{7, ReasonImplausibleDate}, {8, ReasonImplausibleDate}, {9, ReasonDuplicateID}, {10, ReasonDuplicateIDText}, {11, ReasonBlankRow}}
	if !reflect.DeepEqual(got, want) {
		t.Errorf("rejects\n%v\nwant\n%v", got, want)
	}
	if len(s.Records) != 2 || s.Records[1].HasDate || s.Records[1].ID != "8" {
		t.Errorf("records %+v", s.Records)
	}
	wantSum := "read 11: kept 2, rejected 9 (implausible date 2, bad quoting 1, blank row 1, duplicate id 1, duplicate id, different text 1, empty narrative 1, ragged row 1, unparseable date 1)"
	if s.Summary() != wantSum {
		t.Errorf("summary\n%s\nwant\n%s", s.Summary(), wantSum)
	}
	var b bytes.Buffer
	if err := WriteRejects(&b, s.Rejects[:2]); err != nil {
		t.Fatal(err)
	}
	p := s.Rejects[0].File
	wantCSV := "file,line,id,reason,detail\n" + p + ",3,2,ragged row,\"2 fields, header has 3\"\n" +
		p + ",4,,bad quoting,\"4:15: bare \"\" in non-quoted-field\"\n"
	if b.String() != wantCSV {
		t.Errorf("WriteRejects:\n%s\nwant\n%s", b.String(), wantCSV)
	}

	// KeepLast keeps the last version of id 1.
	s, err = readOne(t, "r.csv", in, Options{KeepLast: true})
	if err != nil {
		t.Fatal(err)
	}
	if s.Records[0].Text != "other" || s.Records[0].Line != 10 {
		t.Errorf("KeepLast kept %+v", s.Records[0])
	}
	// RequireDate rejects the row without a date.
	s, _ = readOne(t, "r.csv", in, Options{RequireDate: true})
	if n := len(s.Records); n != 1 {
		t.Errorf("RequireDate kept %d", n)
	}
}

func TestTrailingDelimiter(t *testing.T) {
	s, err := readOne(t, "t.csv", "id,narrative\n1,one,\n2,two,,\n3,three,x\n", Options{})
	if err != nil || len(s.Records) != 2 || s.Rejects[0].Reason != ReasonRaggedRow || s.Rejects[0].Line != 4 {
		t.Errorf("%v %s %+v", err, s.Summary(), s.Rejects)
	}
	// A ragged row's id comes from the id column, wherever it is.
	s, _ = readOne(t, "t.csv", "narrative,id\none,1\ntwo,2,x\n", Options{})
	if s.Rejects[0].ID != "2" {
		t.Errorf("ragged row id %q", s.Rejects[0].ID)
	}
}

func TestQuoteErrorOnLastLine(t *testing.T) {
	// A closed quote followed by text on the last line is bad quoting, not an unclosed
	// quote, with or without a final line end.
	for _, in := range []string{"id,narrative\n1,ok\n2,\"q\"x", "id,narrative\n1,ok\n2,\"q\"x\r\n"} {
		s, err := readOne(t, "q.csv", in, Options{})
		if err != nil || len(s.Rejects) != 1 || s.Rejects[0].Reason != ReasonBadQuoting || s.Rejects[0].Line != 3 {
			t.Errorf("%q: %v %+v", in, err, s)
		}
	}
	for _, in := range []string{"id,narrative\n1,ok\n2,\"open", "id,narrative\n1,ok\n2,\"open\r\n", "id,narrative\r\n1,\"open\r\nmore\r\n"} {
		if _, err := readOne(t, "q.csv", in, Options{}); !errors.Is(err, ErrUnclosedQuote) {
			t.Errorf("%q: %v", in, err)
		}
	}
}

func TestPreamble(t *testing.T) {
	in := "Millbrook Police Department - incident export\nGenerated 1/5/2024, 10:00\n\nid,date,narrative\n" +
		"1,1/1/2024,a\n2,1/2/2024,b\n3,1/3/2024,c\n4,1/4/2024,d\n5,1/5/2024,\"e, with comma\"\n"
	s, err := readOne(t, "p.csv", in, Options{})
	if err != nil || len(s.Records) != 5 || s.Records[0].Line != 5 || !strings.Contains(s.Notes[0], "header is on line 4") {
		t.Fatalf("%v %+v", err, s)
	}
	// Explicit: SkipLines -1 takes line 1 as the header.
	if s, err = readOne(t, "p.csv", in, Options{SkipLines: -1}); err != nil || len(s.Records) != 0 {
		t.Errorf("SkipLines -1: %v %s", err, s.Summary())
	}
}

func TestPlaceholderNarratives(t *testing.T) {
	s, err := readOne(t, "ph.csv", "id,narrative\n1,NULL\n2,N/A\n3,---\n4,nan\n5,No answer at door.\n6,none\n", Options{})
	if err != nil || len(s.Records) != 1 || len(s.Rejects) != 5 || s.Rejects[0].Detail != `only a placeholder: "NULL"` {
		t.Errorf("%v %s %+v", err, s.Summary(), s.Rejects)
	}
}

func TestRepeatedHeader(t *testing.T) {
	// Two exports joined end to end (cat 2019.csv 2020.csv): the second header is a reject.
	s, err := readOne(t, "cat.csv", "id,narrative\n1,a\nid,narrative\n2,b\n", Options{})
	if err != nil || len(s.Records) != 2 || s.Rejects[0].Reason != ReasonRepeatedHeader || s.Rejects[0].Line != 3 {
		t.Errorf("%v %s %+v", err, s.Summary(), s.Rejects)
	}
}

func TestSingleColumn(t *testing.T) {
	s, err := readOne(t, "one.csv", "narrative\nHe said, hello; then left\n\"quoted, too\"\n", Options{})
	if err != nil || len(s.Records) != 2 || s.Records[0].Text != "He said, hello; then left" || s.Records[1].Text != "quoted, too" || s.Files[0].Delimiter != "" {
		t.Errorf("%v %+v", err, s)
	}
}

func TestGzip(t *testing.T) {
	var b bytes.Buffer
	zw := gzip.NewWriter(&b)
	zw.Write([]byte("id,narrative\n1,compressed export\n"))
	zw.Close()
	s, err := readOne(t, "g.csv.gz", b.String(), Options{})
	if err != nil || s.Records[0].Text != "compressed export" || !strings.Contains(s.Notes[0], "gzip") {
		t.Errorf("%v %+v", err, s)
	}
	if _, err := readOne(t, "bad.gz", "\x1f\x8bnot really", Options{}); !errors.Is(err, ErrBinary) {
		t.Errorf("damaged gzip: %v", err)
	}
}

func TestCROnlyLines(t *testing.T) {
	s, err := readOne(t, "mac.csv", "id,narrative\r1,one\r2,two\r", Options{})
	if err != nil || len(s.Records) != 2 || s.Records[1].Line != 3 {
		t.Errorf("%v %+v", err, s)
	}
}

func TestNamedColumnMissing(t *testing.T) {
	_, err := readOne(t, "n.csv", "Report ID,Narrative,District\n1,a,b\n", Options{Text: []string{"narative"}})
	if !errors.Is(err, ErrNoColumn) || !strings.Contains(err.Error(), `did you mean "Narrative"`) || !strings.Contains(err.Error(), `"District"`) {
		t.Errorf("err %v", err)
	}
	s, err := readOne(t, "n.csv", "Report ID,Narrative,District\n1,a,b\n", Options{Text: []string{"narrative"}, Groups: []string{"district"}})
	if err != nil || s.GroupNames[0] != "District" || s.Records[0].Groups[0] != "b" {
		t.Errorf("case-insensitive names: %v %+v", err, s)
	}
}

func TestAutoColumns(t *testing.T) {
	in := "Call Type,Case Number,Reported,Details,Officer Notes\n" +
		"NOISE,24-001,01/13/2024 10:00,loud music at the corner of Elm and 5th reported by caller,ok\n" +
		"ALARM,24-002,01/14/2024,alarm sounding at the Birch Street pharmacy; area checked all clear,ok\n"
	s, err := readOne(t, "a.csv", in, Options{Groups: []string{"Call Type"}})
	if err != nil {
		t.Fatal(err)
	}
	if s.IDName != "Case Number" || s.DateName != "Reported" || s.TextNames[0] != "Details" || s.DateRead != "month-first" {
		t.Errorf("chose id %q date %q text %q (%s); notes %q", s.IDName, s.DateName, s.TextNames, s.DateRead, s.Notes)
	}
	if !reflect.DeepEqual(s.ExtraNames, []string{"Officer Notes"}) || len(s.Columns) != 5 || s.Columns[4] != "Officer Notes" {
		t.Errorf("extra %q", s.ExtraNames)
	}
	// No narrative-like header: the longest mean text; no id header: file:line.
	s, err = readOne(t, "b.csv", "a,b\nx,a longer text here\ny,another longer one\n", Options{})
	if err != nil || s.TextNames[0] != "b" || s.IDName != "" || !strings.HasSuffix(s.Records[0].ID, "b.csv:2") {
		t.Errorf("fallbacks: %v %q %q %q", err, s.TextNames, s.IDName, s.Records[0].ID)
	}
	// A far longer free-text column beats a short narrative-like header.
	long := strings.Repeat("Officer arrived and spoke with the reporting party at length. ", 5)
	s, _ = readOne(t, "l.csv", "id,Call Description,Log\n1,NOISE COMPLAINT,"+long+"\n2,ALARM,"+long+"\n", Options{})
	if s.TextNames[0] != "Log" {
		t.Errorf("chose %q; notes %q", s.TextNames, s.Notes)
	}
	// Several narrative columns are joined by a blank line.
	s, _ = readOne(t, "c.csv", "id,n1,n2\n1,first part,second part\n2,,only second\n", Options{Text: []string{"n1", "n2"}})
	if got := texts(s); !reflect.DeepEqual(got, []string{"first part\n\nsecond part", "only second"}) {
		t.Errorf("joined %q", got)
	}
}

// TestGarbageDates: issue 2, "a date column that is mostly garbage".
func TestGarbageDates(t *testing.T) {
	in := "id,date,narrative\n1,2020-01-05,a\n2,??,b\n3,N/A,c\n4,tbd,d\n5,soon,e\n"
	s, err := readOne(t, "g.csv", in, Options{Date: "date"})
	if err != nil {
		t.Fatal(err)
	}
	if len(s.Records) != 1 || len(s.Rejects) != 4 || s.Rejects[0].Reason != ReasonUnparseableDate {
		t.Errorf("%s", s.Summary())
	}
	mostly := false
	for _, n := range s.Notes {
		mostly = mostly || strings.Contains(n, "mostly not dates")
	}
	if !mostly {
		t.Errorf("no note on a garbage date column: %q", s.Notes)
	}
	// Not named: the column is not chosen, and a note says so.
	s, _ = readOne(t, "g.csv", in, Options{})
	if s.DateName != "" || len(s.Records) != 5 {
		t.Errorf("auto chose %q, kept %d", s.DateName, len(s.Records))
	}
}

// TestDayFirstColumn: the day-first rule of the brief (a first field > 12 in some row,
// none with a second field > 12); 25/12/2020 can only be 25 December.
func TestDayFirstColumn(t *testing.T) {
	in := "id,date,narrative\n1,03/04/2020,a\n2,25/12/2020,b\n"
	s, err := readOne(t, "d.csv", in, Options{})
	if err != nil || s.DateRead != "day-first" || s.Records[0].Date.Month() != 4 {
		t.Errorf("%v %q %v", err, s.DateRead, s.Notes)
	}
	s, _ = readOne(t, "d.csv", in, Options{DateFormat: "%d/%m/%Y"})
	if s.Records[0].Date.Month() != 4 || s.DateRead != "layout 02/01/2006" {
		t.Errorf("explicit format: %q %v", s.DateRead, s.Records[0].Date)
	}
	// A format no automatic reading knows still finds its column.
	s, err = readOne(t, "e.csv", "id,when,narrative\n1,2020y01m05d,a\n2,2020y02m06d,b\n", Options{DateFormat: "2006y01m02d"})
	if err != nil || s.DateName != "when" || s.Records[1].Date.Month() != 2 {
		t.Errorf("explicit layout column: %v %q", err, s.DateName)
	}
	_, err = readOne(t, "d.csv", in, Options{DateFormat: "dd/mm"})
	if !errors.Is(err, ErrDateFormat) {
		t.Errorf("bad format option: %v", err)
	}
}

// TestConflictingDateOrder: in a column where two values read only month-first and one
// only day-first, the column is read month-first and the odd value is rejected with a
// reason of its own that says what it would have been; the note counts it.
func TestConflictingDateOrder(t *testing.T) {
	in := "id,date,narrative\n1,03/25/2020,a\n2,04/13/2020,b\n3,25/12/2020,c\n4,02/03/2020,d\n"
	s, err := readOne(t, "c.csv", in, Options{})
	if err != nil {
		t.Fatal(err)
	}
	if s.DateRead != "month-first" || len(s.Records) != 3 || len(s.Rejects) != 1 {
		t.Fatalf("read %q, %d records, rejects %+v", s.DateRead, len(s.Records), s.Rejects)
	}
	r := s.Rejects[0]
	wantDetail := `"25/12/2020": the column is read month-first; this value reads only day-first (as 2020-12-25)`
	if r.Line != 4 || r.Reason != ReasonOtherDateOrder || r.Detail != wantDetail {
		t.Errorf("reject %+v", r)
	}
	if !slices.ContainsFunc(s.Notes, func(n string) bool { return strings.Contains(n, "other day/month order 1") }) {
		t.Errorf("notes %q", s.Notes)
	}
}

// TestEncodings: byte-order marks EF BB BF, FF FE, FE FF are those of the Unicode
// Standard's byte order mark table (from memory); Windows-1252 byte values from Microsoft's
// published code page table (from memory): E9 é, 96 en dash, 93/94 curly quotes.
func TestEncodings(t *testing.T) {
	const text = "id,narrative\n1,caf\u00e9 \u2013 \u201cquoted\u201d\n"
	utf16 := func(be bool) []byte {
		var b []byte
		if be {
			b = []byte{0xFE, 0xFF}
		} else {
			b = []byte{0xFF, 0xFE}
		}
		for _, r := range text { // all in the BMP
			hi, lo := byte(r>>8), byte(r)
			if be {
				b = append(b, hi, lo)
			} else {
				b = append(b, lo, hi)
			}
		}
		return b
	}
	// Windows-1252: 0xE9 é, 0x96 en dash, 0x93 0x94 curly quotes (the code page's
	// published table, from memory).
	cp1252 := []byte("id,narrative\n1,caf\xe9 \x96 \x93quoted\x94\n")
	tests := []struct {
		name    string
		in      []byte
		enc     string
		invalid int
		want    string
	}{
		{"utf8", []byte(text), EncUTF8, 0, "caf\u00e9 \u2013 \u201cquoted\u201d"},
		{"bom", append([]byte{0xEF, 0xBB, 0xBF}, text...), EncUTF8BOM, 0, "caf\u00e9 \u2013 \u201cquoted\u201d"},
		{"utf16le", utf16(false), EncUTF16LE, 0, "caf\u00e9 \u2013 \u201cquoted\u201d"},
		{"utf16be", utf16(true), EncUTF16BE, 0, "caf\u00e9 \u2013 \u201cquoted\u201d"},
		{"cp1252", cp1252, EncWindows1252, 0, "caf\u00e9 \u2013 \u201cquoted\u201d"},
	}
	for _, tt := range tests {
		s, err := Read(context.Background(), []string{writeFile(t, tt.name+".csv", tt.in)}, nil, Options{Now: testNow})
		if err != nil {
			t.Fatalf("%s: %v", tt.name, err)
		}
		if s.Files[0].Encoding != tt.enc || s.Records[0].Text != tt.want || s.IDName != "id" {
			t.Errorf("%s: encoding %q text %q id %q", tt.name, s.Files[0].Encoding, s.Records[0].Text, s.IDName)
		}
	}
	// Mixed: two UTF-8 lines and one Windows-1252 line -> UTF-8, one invalid line.
	mixed := []byte("id,narrative\n1,caf\u00e9\n2,na\u00efve\n3,caf\xe9\n")
	s, err := Read(context.Background(), []string{writeFile(t, "mixed.csv", mixed)}, nil, Options{Now: testNow})
	if err != nil {
		t.Fatal(err)
	}
	if f := s.Files[0]; f.Encoding != EncUTF8 || f.InvalidLines != 1 || s.Records[2].Text != "caf\uFFFD" || len(s.Notes) == 0 {
		t.Errorf("mixed: %+v %q %q", f, s.Records[2].Text, s.Notes)
	}
	s, _ = Read(context.Background(), []string{writeFile(t, "mixed.csv", mixed)}, nil, Options{Now: testNow, RejectBadEncoding: true})
	if len(s.Records) != 2 || len(s.Rejects) != 1 || s.Rejects[0].Reason != ReasonBadEncoding || s.Rejects[0].Line != 4 {
		t.Errorf("RejectBadEncoding: %s %+v", s.Summary(), s.Rejects)
	}
	// Mostly Windows-1252 -> Windows-1252, the UTF-8 line counted.
	mixed = []byte("id,narrative\n1,caf\xe9\n2,na\xefve\n3,caf\u00e9\n")
	s, _ = Read(context.Background(), []string{writeFile(t, "mixed2.csv", mixed)}, nil, Options{Now: testNow})
	if f := s.Files[0]; f.Encoding != EncWindows1252 || f.InvalidLines != 1 || s.Records[0].Text != "caf\u00e9" {
		t.Errorf("mixed2: %+v", f)
	}
}

// TestJSON: JSON Lines (jsonlines.org: one JSON value per line, UTF-8) and RFC 8259
// arrays of objects; the scalar-to-text rules are ours (package documentation).
// TestJSONSyntaxPosition: a syntax error inside an array element names the line and
// column of the offending byte (positions counted by hand, 1-based, in bytes as
// encoding/csv counts columns); the messages are encoding/json's.
func TestJSONSyntaxPosition(t *testing.T) {
	tests := []struct{ in, want string }{
		{"[\n{\"narrative\": \"x\"},\n{\"narrative\": \"y\",\n \"c\": 3 x}\n]", "a.json:4:9: bad JSON: invalid character 'x' after object key:value pair"},
		{`[{"narrative": "a"}, {"b": 2 x}]`, "a.json:1:30: bad JSON: invalid character 'x' after object key:value pair"},
		{`[{"narrative": "a"},,{"b": 2}]`, "a.json:1:21: bad JSON: invalid character ',' looking for beginning of value"},
	}
	for _, tt := range tests {
		_, err := readOne(t, "a.json", tt.in, Options{})
		var pe *PosError
		if !errors.As(err, &pe) || !strings.HasSuffix(err.Error(), tt.want) {
			t.Errorf("%q: %v, want …%s", tt.in, err, tt.want)
		}
	}
}

func TestJSON(t *testing.T) {
	arr := `[
  {"id": 1, "narrative": "first", "nested": {"a": [1, 2]}, "flag": true},
  {"id": "2", "narrative": "second", "extra": null},
  {"id": 3.5, "narrative": ""},
  42
]`
	s, err := readOne(t, "a.json", arr, Options{})
	if err != nil {
		t.Fatal(err)
	}
	if s.Files[0].Format != "json" || !reflect.DeepEqual(texts(s), []string{"first", "second"}) {
		t.Fatalf("%s %q", s.Summary(), texts(s))
	}
	if s.Records[0].ID != "1" || !reflect.DeepEqual(s.ExtraNames, []string{"nested", "flag", "extra"}) ||
		!reflect.DeepEqual(s.Records[0].Extra, []string{`{"a":[1,2]}`, "true", ""}) {
		t.Errorf("%q %q %q", s.Records[0].ID, s.ExtraNames, s.Records[0].Extra)
	}
	lines := []int{s.Records[0].Line, s.Records[1].Line, s.Rejects[0].Line, s.Rejects[1].Line}
	if !reflect.DeepEqual(lines, []int{2, 3, 4, 5}) || s.Rejects[1].Reason != ReasonBadJSON {
		t.Errorf("lines %v rejects %+v", lines, s.Rejects)
	}
	jl := "{\"id\":\"a\",\"text\":\"one\"}\n\n{\"id\":\"b\",\"text\":\"two\"}\n{broken\n"
	s, err = readOne(t, "a.jsonl", jl, Options{})
	if err != nil || len(s.Records) != 2 || s.Rejects[0].Line != 4 || s.Rejects[0].Reason != ReasonBadJSON {
		t.Errorf("jsonl: %v %s %+v", err, s.Summary(), s.Rejects)
	}
	wrapped := "{\n \"meta\": {\"n\": [1]},\n \"records\": [\n  {\"id\": \"a\", \"text\": \"one\"},\n  {\"id\": \"b\", \"text\": \"two\"}\n ]\n}\n"
	s, err = readOne(t, "w.json", wrapped, Options{})
	if err != nil || len(s.Records) != 2 || s.Records[1].Line != 5 || s.Records[1].Text != "two" {
		t.Errorf("wrapped: %v %+v", err, s)
	}
	_, err = readOne(t, "b.json", `[{"id":1,"text":"x"}, {"id":`, Options{})
	if err == nil {
		t.Error("truncated array accepted")
	}
}

func TestTextDirAndStdin(t *testing.T) {
	dir := t.TempDir()
	os.WriteFile(filepath.Join(dir, "b.txt"), []byte("Date: 2020-01-05\nSecond narrative.\n"), 0o644)
	os.WriteFile(filepath.Join(dir, "a.txt"), []byte("First narrative, no date line.\n"), 0o644)
	os.WriteFile(filepath.Join(dir, "c.txt"), []byte("caf\xe9 in Windows-1252\n"), 0o644)
	os.WriteFile(filepath.Join(dir, "skip.md"), []byte("not read"), 0o644)
	s, err := Read(context.Background(), []string{dir}, nil, Options{Now: testNow})
	if err != nil {
		t.Fatal(err)
	}
	if len(s.Records) != 3 || s.Records[0].ID != "a" || s.Records[1].ID != "b" || !s.Records[1].HasDate || s.Records[1].Text != "Second narrative." ||
		s.Records[2].Text != "caf\u00e9 in Windows-1252" || s.Files[0].Encoding != "mixed: utf-8 2, windows-1252 1" {
		t.Errorf("%+v %+v", s.Records, s.Files)
	}
	s, err = Read(context.Background(), []string{"-"}, strings.NewReader("id\tnarrative\n1\tfrom stdin\n"), Options{Now: testNow})
	if err != nil || s.Records[0].File != StdinName || s.Records[0].Text != "from stdin" {
		t.Errorf("stdin: %v %+v", err, s)
	}
}

func TestSeveralFiles(t *testing.T) {
	a := writeFile(t, "2019.csv", []byte("id,narrative,district\n1,one,N\n"))
	b := writeFile(t, "2020.csv", []byte("district,id,narrative\nS,2,two\n"))
	c := writeFile(t, "2021.csv", []byte("id,narrative,beat\n3,three,7\n"))
	s, err := Read(context.Background(), []string{a, b}, nil, Options{Now: testNow, Groups: []string{"district"}})
	if err != nil || len(s.Records) != 2 || s.Records[1].Groups[0] != "S" || s.Records[1].File != b {
		t.Fatalf("%v %+v", err, s)
	}
	_, err = Read(context.Background(), []string{a, c}, nil, Options{Now: testNow})
	if !errors.Is(err, ErrColumns) || !strings.HasPrefix(err.Error(), c+":1:") || !strings.Contains(err.Error(), `missing "district"; extra "beat"`) {
		t.Errorf("err %v", err)
	}
}

// TestXLSX builds a workbook with excelize itself (the reference library of the brief)
// and reads it back; serial 43835.6041666667 is 2020-01-05 14:30 by the 1900 date system
// (see TestExcelSerial).
func TestXLSX(t *testing.T) {
	f := excelize.NewFile()
	f.SetSheetRow("Sheet1", "A1", &[]any{"Incident No", "Occurred", "Synopsis", "Zone"})
	f.SetSheetRow("Sheet1", "A2", &[]any{"A-1", 43835.6041666667, "Caller reported a loose dog on Maple Row.", "East"})
	f.SetSheetRow("Sheet1", "A4", &[]any{"A-2", 43836, "Alarm at the Quarry Lane library, all clear.", "West"})
	f.SetSheetRow("Sheet1", "A5", &[]any{"A-3", 43837, "Too many cells", "West", "spill"})
	f.SetSheetRow("Sheet1", "A6", &[]any{"A-4", time.Date(2020, 1, 8, 9, 15, 0, 0, time.UTC), "A date-typed cell.", "East"})
	f.NewSheet("Other")
	f.SetSheetRow("Other", "A1", &[]any{"id", "text"})
	f.SetSheetRow("Other", "A2", &[]any{"9", "from the other sheet"})
	var buf bytes.Buffer
	if _, err := f.WriteTo(&buf); err != nil {
		t.Fatal(err)
	}
	// Extension says .csv: the bytes decide.
	p := writeFile(t, "book.csv", buf.Bytes())
	s, err := Read(context.Background(), []string{p}, nil, Options{Now: testNow})
	if err != nil {
		t.Fatal(err)
	}
	if s.Files[0].Format != "xlsx" || s.DateName != "Occurred" || s.IDName != "Incident No" || len(s.Records) != 3 {
		t.Fatalf("%+v %s %q", s.Files, s.Summary(), s.Notes)
	}
	if got := s.Records[0].Date.Format("2006-01-02 15:04"); got != "2020-01-05 14:30" || s.Records[1].Line != 4 {
		t.Errorf("date %s line %d", got, s.Records[1].Line)
	}
	if got := s.Records[2].Date.Format("2006-01-02 15:04"); got != "2020-01-08 09:15" {
		t.Errorf("date-typed cell read as %s", got)
	}
	if s.Rejects[0].Reason != ReasonRaggedRow || s.Rejects[0].Line != 5 {
		t.Errorf("rejects %+v", s.Rejects)
	}
	s, err = Read(context.Background(), []string{p}, nil, Options{Now: testNow, Sheet: "other"})
	if err != nil || s.Records[0].Text != "from the other sheet" {
		t.Errorf("sheet option: %v", err)
	}
	if _, err = Read(context.Background(), []string{p}, nil, Options{Now: testNow, Sheet: "nope"}); err == nil || !strings.Contains(err.Error(), `"Other"`) {
		t.Errorf("missing sheet: %v", err)
	}
}

func TestHugeField(t *testing.T) {
	if testing.Short() {
		t.Skip("50 MB field")
	}
	// A 50 MB narrative (the brief), plus one over 128 KiB (issue 2), generated here.
	big := strings.Repeat("word ", 10<<20)
	mid := strings.Repeat("x", 200<<10)
	in := "id,narrative\n1,\"" + big + "\"\n2," + mid + "\n3,small\n"
	s, err := readOne(t, "big.csv", in, Options{})
	if err != nil {
		t.Fatal(err)
	}
	if len(s.Records) != 3 || len(s.Records[0].Text) != len(big)-1 || len(s.Records[1].Text) != len(mid) || s.Records[2].Line != 4 {
		t.Errorf("%s", s.Summary())
	}
}

// TestAgainstPythonCSV reads testdata/tricky.csv, written by Python's csv module, and
// compares every record with Python's csv.reader (testdata/tricky_expected.json, from
// testdata/gen_tricky_csv.py). One documented difference: encoding/csv turns a CRLF
// inside a quoted field into LF, where Python keeps CRLF.
func TestAgainstPythonCSV(t *testing.T) {
	b, err := os.ReadFile(filepath.Join("testdata", "tricky_expected.json"))
	if err != nil {
		t.Fatal(err)
	}
	var want []struct {
		Line   int
		Fields []string
	}
	if err := json.Unmarshal(b, &want); err != nil {
		t.Fatal(err)
	}
	s, err := Read(context.Background(), []string{filepath.Join("testdata", "tricky.csv")}, nil, Options{Now: testNow})
	if err != nil {
		t.Fatal(err)
	}
	if s.Files[0].Delimiter != "," || s.IDName != "Report No" || s.DateName != "Occurred" || s.TextNames[0] != "Narrative" {
		t.Fatalf("%+v %q %q %q", s.Files[0], s.IDName, s.DateName, s.TextNames)
	}
	want = want[1:] // header
	if s.Read != len(want) {
		t.Fatalf("%s; want %d rows", s.Summary(), len(want))
	}
	// Narratives of only quote marks hold no letter or digit: rejected as empty
	// (package documentation); the rest are kept.
	var kept []int
	for i, w := range want {
		if placeholder(strings.TrimSpace(w.Fields[2])) {
			continue
		}
		kept = append(kept, i)
	}
	if len(s.Records) != len(kept) || len(s.Rejects) != len(want)-len(kept) {
		t.Fatalf("%s; want %d kept", s.Summary(), len(kept))
	}
	for k, r := range s.Records {
		i := kept[k]
		w := want[i].Fields
		text := strings.TrimSpace(strings.ReplaceAll(w[2], "\r\n", "\n"))
		if r.ID != w[0] || r.Text != text || r.Extra[0] != w[3] || r.Line != want[i].Line {
			t.Errorf("record %d: %q %q %q line %d; want %q %q %q line %d", i, r.ID, r.Text, r.Extra[0], r.Line, w[0], text, w[3], want[i].Line)
		}
	}
}
