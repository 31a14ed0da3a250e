package text

import (
	"strings"
	"testing"
)

// marked strips '§' markers from s: each pair of markers encloses one expected token span.
func marked(t *testing.T, s string) (string, [][2]int) {
	t.Helper()
	var b strings.Builder
	var spans [][2]int
	open := -1
	for _, r := range s {
		if r == '§' {
			if open < 0 {
				open = b.Len()
			} else {
				spans = append(spans, [2]int{open, b.Len()})
				open = -1
			}
			continue
		}
		b.WriteRune(r)
	}
	if open >= 0 {
		t.Fatalf("unbalanced markers in %q", s)
	}
	return b.String(), spans
}

// The rules are our own (token.go's scan comment); the abbreviation expansions come from the
// shipped table (common practice, written from memory).
func TestAnalyze(t *testing.T) {
	s := DefaultSettings()
	s.Tokens.Numbers, s.Tokens.Times, s.Tokens.Dates = Keep, Keep, Keep
	tests := []struct {
		name string
		in   string // '§' marks each token's span in the raw narrative
		want []string
	}{
		{"words and case", "§The§ §Officer§ §ARRIVED§.", []string{"the", "officer", "arrived"}},
		{"possessive", "§the§ §driver's§ §wife§ §drivers§' §car§", []string{"the", "driver", "wife", "drivers", "car"}},
		{"contraction", "§He§ §didn't§ §know§", []string{"he", "didn't", "know"}},
		{"curly apostrophe", "§Don’t§ §move§", []string{"don't", "move"}},
		{"abbreviations", "§RP§ §saw§ §veh§ §w/§ §susp§", []string{"reporting", "party", "saw", "vehicle", "with", "suspect"}},
		{"w/o and n/a", "§w/o§ §lights§, §N/A§", []string{"without", "lights", "not", "applicable"}},
		{"and/or splits", "§and§/§or§", []string{"and", "or"}},
		{"time with meridiem", "§at§ §9:45 a.m.§ §and§ §14:30§", []string{"at", "9:45am", "and", "14:30"}},
		{"time pm", "§9:00pm§", []string{"9:00pm"}},
		{"dates", "§on§ §8/10/2017§ §or§ §2017-08-10§", []string{"on", "8/10/2017", "or", "2017-08-10"}},
		{"code", "§a§ §10-50§ §with§ §injuries§", []string{"a", "10-50", "with", "injuries"}},
		{"numbers", "§1,250§ §ft§ §3.5§ §mi§", []string{"1,250", "ft", "3.5", "mi"}},
		{"hyphenated words split", "§self§-§inflicted§", []string{"self", "inflicted"}},
		{"line-end hyphenation", "§resi-\ndence§ §and§ §Smith§-\n§Jones§", []string{"residence", "and", "smith", "jones"}},
		{"hyphenation crlf", "§apart-\r\n  ment§", []string{"apartment"}},
		{"html entities", "§fish§&amp;§chips§ §caf&eacute;§&nbsp;§now§", []string{"fish", "chips", "café", "now"}},
		{"html numeric", "§it&#39;s§ §done§", []string{"it", "done"}},
		{"html tags", "§line§<br />§two§ <b>§bold§</b>", []string{"line", "two", "bold"}},
		{"double escaped", "§a§&amp;nbsp;§b§", []string{"a", "b"}},
		{"escaped tag", "§one§&lt;br /&gt;§two§ &lt; §three§", []string{"one", "two", "three"}},
		{"nfkc ligature", "§ﬁre§ §ｆｕｌｌ§", []string{"fire", "full"}},
		{"combining accent", "§cafe\u0301§", []string{"café"}},
		{"ocr digits stay in word", "§0fficer§ §veh1cle§", []string{"0fficer", "veh1cle"}},
		{"unicode dash", "§north§—§south§", []string{"north", "south"}},
		{"invalid utf8", "§ab§\xff§cd§", []string{"ab", "cd"}},
	}
	for _, tt := range tests {
		t.Run(tt.name, func(t *testing.T) {
			raw, spans := marked(t, tt.in)
			toks := Analyze(raw, s)
			var got []string
			for _, tk := range toks {
				got = append(got, tk.Text)
			}
			if strings.Join(got, "|") != strings.Join(tt.want, "|") {
				t.Fatalf("texts %q, want %q", got, tt.want)
			}
			// Expanded abbreviations share one span; collapse equal consecutive spans.
			var gotSpans [][2]int
			for _, tk := range toks {
				sp := [2]int{tk.Start, tk.End}
				if n := len(gotSpans); n == 0 || gotSpans[n-1] != sp {
					gotSpans = append(gotSpans, sp)
				}
			}
			if len(gotSpans) != len(spans) {
				t.Fatalf("spans %v, want %v", gotSpans, spans)
			}
			for i := range spans {
				if gotSpans[i] != spans[i] {
					t.Errorf("span %d = %v %q, want %v %q", i, gotSpans[i], raw[gotSpans[i][0]:gotSpans[i][1]], spans[i], raw[spans[i][0]:spans[i][1]])
				}
			}
		})
	}
}

func TestPolicies(t *testing.T) {
	raw := "At 9:45 on 8/10/2017 unit 10-50 had 3 calls, the 2nd at 5uspect"
	tests := []struct {
		p    Policy
		want string
	}{
		{Drop, "at|on|unit|had|calls|the|at|5uspect"},
		{Keep, "at|9:45|on|8/10/2017|unit|10-50|had|3|calls|the|2nd|at|5uspect"},
		{Placeholder, "at|_time_|on|_date_|unit|_code_|had|_number_|calls|the|_number_|at|5uspect"},
	}
	for _, tt := range tests {
		s := DefaultSettings()
		s.Tokens = TokenSettings{Numbers: tt.p, Times: tt.p, Dates: tt.p, Codes: tt.p}
		var got []string
		for _, tk := range Analyze(raw, s) {
			got = append(got, tk.Text)
			if tk.Kind != Word && !tk.Protected {
				t.Errorf("%v token %q not protected", tk.Kind, tk.Text)
			}
		}
		if g := strings.Join(got, "|"); g != tt.want {
			t.Errorf("policy %s: %s, want %s", tt.p, g, tt.want)
		}
	}
}

func TestNormalize(t *testing.T) {
	tests := []struct{ in, want string }{
		{"  The  RP&#39;s\tveh<br/>was &amp; is  ", "the rp's veh was & is"},
		{"resi-\ndence “quoted” – dash", "residence \"quoted\" - dash"},
		{"a\u00a0b\u200bc", "a bc"},
		{"<p>Ofc.</p>\n\n<p>Next</p>", "ofc. next"},
	}
	for _, tt := range tests {
		if got := Normalize(tt.in); got != tt.want {
			t.Errorf("Normalize(%q) = %q, want %q", tt.in, got, tt.want)
		}
	}
}

func TestStopAndStemFilters(t *testing.T) {
	s := DefaultSettings()
	set, err := s.Stop.Set()
	if err != nil {
		t.Fatal(err)
	}
	p := Pipeline{NewStopFilter(set, 2), NewStemFilter()}
	toks := p.Run(Analyze("The subj's vehicles were stopped at 10-50 w/ a flat tire", s))
	var got []string
	for _, tk := range toks {
		got = append(got, tk.Text)
	}
	// Stems are Porter2's (Snowball English); "were", "at", "with", "a" are in the en list.
	if g := strings.Join(got, "|"); g != "subject|vehicl|stop|10-50|flat|tire" {
		t.Errorf("got %s", g)
	}
}

func TestAbbrevTable(t *testing.T) {
	m := ShippedAbbrev()
	for k, want := range map[string]string{"veh": "vehicle", "subj": "subject", "rp": "reporting party", "dob": "date of birth", "w/": "with", "goa": "gone on arrival", "utl": "unable to locate"} {
		if m[k] != want {
			t.Errorf("shipped[%q] = %q, want %q", k, m[k], want)
		}
	}
	user, err := ParseAbbrev("mine.txt", strings.NewReader("# ours\nveh = truck\nres =\nbldg   =  big   building \n"))
	if err != nil {
		t.Fatal(err)
	}
	a := NewAbbrev(true, user)
	if e, _ := a.Lookup("veh"); strings.Join(e, " ") != "truck" {
		t.Errorf("override: %v", e)
	}
	if _, ok := a.Lookup("res"); ok {
		t.Error("res not removed")
	}
	if e, _ := a.Lookup("bldg"); strings.Join(e, " ") != "big building" {
		t.Errorf("bldg: %v", e)
	}
	_, err = ParseAbbrev("bad.txt", strings.NewReader("ok = fine\nno equals here\n"))
	if err == nil || !strings.HasPrefix(err.Error(), "bad.txt:2:") {
		t.Errorf("err = %v", err)
	}
}

// Pathological residue stays fast (linear): many unclosed comments and tags.
func TestPathologicalHTML(t *testing.T) {
	raw := strings.Repeat("<!-- x ", 20000) + strings.Repeat("<a ", 20000) + strings.Repeat("&amp;", 20000)
	toks := Analyze(raw, DefaultSettings())
	if len(toks) == 0 {
		t.Fatal("no tokens")
	}
}
