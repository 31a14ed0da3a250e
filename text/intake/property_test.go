package intake

import (
	"bytes"
	"fmt"
	"math/rand/v2"
	"strings"
	"testing"
)

// messyCSV builds a seeded, deliberately broken export: random field counts, stray and
// doubled quotes, multi-line fields, blank lines, repeated ids, bad and implausible
// dates, Windows-1252 bytes.
func messyCSV(rng *rand.Rand) []byte {
	var b bytes.Buffer
	b.WriteString("id,date,narrative,district\n")
	dates := []string{"2020-01-05", "1/13/2021", "13/1/2021", "garbage", "", "1850-01-01", "2099-01-01", "Jan 5, 2020", "45000"}
	texts := []string{"checked the area", "\"quoted, with comma\"", "\"multi\nline\"", "", "x\"y", "\"unterminated", "caf\xe9", "\"a \"\"b\"\" c\""}
	n := rng.IntN(30)
	for i := 0; i < n; i++ {
		if rng.IntN(10) == 0 {
			b.WriteString("\n")
			continue
		}
		fields := []string{fmt.Sprint(rng.IntN(12)), dates[rng.IntN(len(dates))], texts[rng.IntN(len(texts))], "N"}
		fields = fields[:1+rng.IntN(4)]
		if rng.IntN(8) == 0 {
			fields = append(fields, "extra")
		}
		b.WriteString(strings.Join(fields, ","))
		b.WriteString("\n")
	}
	return b.Bytes()
}

// TestAccountingProperty checks K + J = R (issue 2 item 5) on 500 seeded messy files,
// in plain `go test` (the fuzz targets explore further under -fuzz).
func TestAccountingProperty(t *testing.T) {
	rng := rand.New(rand.NewPCG(2, 7))
	for i := 0; i < 500; i++ {
		data := messyCSV(rng)
		for _, opt := range []Options{{}, {KeepLast: true, LazyQuotes: true}, {RequireDate: true, RejectBadEncoding: true, DateOrder: DayFirst}} {
			s, err := readBytes("m.csv", data, opt)
			checkAccounting(t, data, s, err)
			if err == nil {
				lines := bytes.Count(data, []byte("\n")) + 1
				for _, r := range s.Rejects {
					if r.Line > lines {
						t.Fatalf("reject line %d beyond %d lines: %q", r.Line, lines, data)
					}
				}
			}
		}
	}
}

// TestDeterministic reads the safenet corpus twice and compares the survey text and the
// rejects byte for byte (RULES.md: same input and settings, byte-identical output).
func TestDeterministic(t *testing.T) {
	dir := sharedDir(t)
	paths := []string{dir + "/corpora/safenet/SAFENET_2005.csv", dir + "/corpora/safenet/SAFENET_2006.csv"}
	var outs [2]string
	for i := range outs {
		s, err := readPaths(paths)
		if err != nil {
			t.Fatal(err)
		}
		var b bytes.Buffer
		Survey(s, SurveyOptions{}).WriteText(&b)
		WriteRejects(&b, s.Rejects)
		outs[i] = b.String()
	}
	if outs[0] != outs[1] {
		t.Error("two runs differ")
	}
}

func TestParseDateOrder(t *testing.T) {
	for in, want := range map[string]DateOrder{"": OrderAuto, "auto": OrderAuto, "MDY": MonthFirst, "day-first": DayFirst, "dmy": DayFirst} {
		if got, err := ParseDateOrder(in); err != nil || got != want {
			t.Errorf("ParseDateOrder(%q) = %v, %v", in, got, err)
		}
		if got, _ := ParseDateOrder(want.String()); got != want {
			t.Errorf("round trip of %v", want)
		}
	}
	if _, err := ParseDateOrder("sideways"); err == nil {
		t.Error("accepted sideways")
	}
}
