package intake

import (
	"bytes"
	"context"
	"errors"
	"os"
	"path/filepath"
	"testing"

	"github.com/xuri/excelize/v2"
)

// readBytes reads one in-memory file as Read would.
func readBytes(name string, data []byte, opt Options) (*Set, error) {
	if opt.Now.IsZero() {
		opt.Now = testNow
	}
	t, err := readSource(context.Background(), name, bytes.NewReader(data), int64(len(data)), &opt)
	if err != nil {
		return nil, err
	}
	return assemble(context.Background(), []*table{t}, &opt)
}

// checkAccounting is the property of issue 2 item 5: K + J = R, and every reject and
// record names its file and a line.
func checkAccounting(t *testing.T, data []byte, s *Set, err error) {
	t.Helper()
	if err != nil {
		var pe *PosError
		if !errors.As(err, &pe) {
			t.Fatalf("error without a position: %v", err)
		}
		return
	}
	if len(s.Records)+len(s.Rejects) != s.Read {
		t.Fatalf("kept %d + rejected %d != read %d for %q", len(s.Records), len(s.Rejects), s.Read, data)
	}
	for _, r := range s.Rejects {
		if r.File == "" || r.Line < 1 || r.Reason == "" {
			t.Fatalf("reject without position or reason: %+v", r)
		}
	}
	for _, r := range s.Records {
		if r.File == "" || r.Line < 1 || r.Text == "" || r.ID == "" {
			t.Fatalf("record without position, id or text: %+v", r)
		}
	}
}

func FuzzReadCSV(f *testing.F) {
	for _, s := range []string{
		"id,date,narrative\n1,2020-01-05,a\n2,2020-01-06,b\n",
		"id,narrative\n1,\"multi\nline\"\n2,\"b\"\"q\"\n",
		"id;narrative\n1;a\n2\n3;x;y\n",
		"\"ID\", \"Narrative\"\n\"1\",\"one\"\n",
		"id\tnarrative\n1\tx\"y\n",
		"a,b\n1,\"unclosed\n",
		"\xef\xbb\xbfid,text\n1,caf\xc3\xa9\n",
		"\xff\xfei\x00d\x00,\x00t\x00\n\x001\x00,\x00x\x00\n\x00",
		"id,text\n1,caf\xe9\n",
		"id,text\n,\n,\n1,a\n1,b\n",
		"date,text\n13/1/2020,a\n1/13/2020,b\n45000,c\n",
	} {
		f.Add([]byte(s))
	}
	f.Fuzz(func(t *testing.T, data []byte) {
		s, err := readBytes("f.csv", data, Options{})
		checkAccounting(t, data, s, err)
		s, err = readBytes("f.csv", data, Options{LazyQuotes: true, KeepLast: true})
		checkAccounting(t, data, s, err)
	})
}

func FuzzReadJSON(f *testing.F) {
	for _, s := range []string{
		`[{"id":1,"narrative":"a","date":"2020-01-05"},{"id":2,"narrative":"b"}]`,
		"{\"id\":1,\"text\":\"a\"}\n{\"id\":1,\"text\":\"b\"}\n{bad\n",
		`[{"id":1,"text":{"nested":[1,2,null]}}, 5, "x", null]`,
		`[`,
		`{"a":1}{"a":2}`,
		"[\n{\"t\":\"\\u00e9\"}\n]",
		"{\"meta\":{\"n\":1},\n\"records\":[{\"id\":1,\"text\":\"a\"},{\"id\":2,\"text\":\"b\"}]}",
		"{\n\"data\": [[1, 2], {\"id\": 3}]\n}",
	} {
		f.Add([]byte(s))
	}
	f.Fuzz(func(t *testing.T, data []byte) {
		s, err := readBytes("f.json", data, Options{})
		checkAccounting(t, data, s, err)
	})
}

func FuzzReadXLSX(f *testing.F) {
	book := excelize.NewFile()
	book.SetSheetRow("Sheet1", "A1", &[]any{"id", "date", "narrative"})
	book.SetSheetRow("Sheet1", "A2", &[]any{1, 43835.5, "first"})
	book.SetSheetRow("Sheet1", "A3", &[]any{2, "2020-01-06", "second", "extra"})
	var buf bytes.Buffer
	if _, err := book.WriteTo(&buf); err != nil {
		f.Fatal(err)
	}
	f.Add(buf.Bytes())
	f.Add([]byte("PK\x03\x04"))
	f.Fuzz(func(t *testing.T, data []byte) {
		s, err := readBytes("f.xlsx", data, Options{})
		checkAccounting(t, data, s, err)
	})
}

// FuzzReadTextDir reads a folder holding one fuzzed .txt file.
func FuzzReadTextDir(f *testing.F) {
	for _, s := range []string{"Date: 2020-01-05\nA narrative.\n", "no date line", "Date: garbage\n", "\xff\xfeD\x00a\x00", "caf\xe9", ""} {
		f.Add([]byte(s))
	}
	f.Fuzz(func(t *testing.T, data []byte) {
		dir := t.TempDir()
		if err := os.WriteFile(filepath.Join(dir, "n.txt"), data, 0o644); err != nil {
			t.Fatal(err)
		}
		s, err := Read(context.Background(), []string{dir}, nil, Options{Now: testNow})
		checkAccounting(t, data, s, err)
		if err == nil && s.Read != 1 {
			t.Fatalf("read %d rows from one file", s.Read)
		}
	})
}
