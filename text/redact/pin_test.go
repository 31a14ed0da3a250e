package redact

import (
	"crypto/sha256"
	"encoding/binary"
	"encoding/csv"
	"encoding/hex"
	"hash"
	"os"
	"strings"
	"sync"
	"testing"
	"undercurrent/text/demotown"
)

// Pinned output. The redactor's output (text and spans) on the corpora below was hashed
// with the code as it stood before the speed work of the redactspeed branch (commit
// 78b5097); every later change to the detectors' speed must give byte-identical output.
// A change meant to alter what is redacted must update these values and say why in its
// commit message.
var pinned = map[string]string{
	"demo":         "aed47d31840d652f65e666c07b0be385e2ce74c9b85b325ab306a0ab1429e04d",
	"demo-again":   "e157318ea7c2d80daf5eecf66182024d9f203aff6b98db1ea08416713a34bb1a",
	"generated":    "ca1ac3da5fc2bbc351ce168594facb702477da16406ce1e962919a18d160bf5a",
	"bench-set":    "d3f13a475a6baddb977a506a178bdde6f87369bb5449bd549bb4bb1b91ac0fed",
	"fuzz-seeds":   "75e4ea8d8dcc535012859048cc8c1cd23c37dc28ba9a38190eb6e3021ea9c4ca",
	"osha":         "4659e4cfb8d2fa856aa8cce46362ec6bff47221d0ff0d8bb781a0b40e444dfee",
	"osha-caps":    "ea6651514576d91ad7492fa73548d4007497cd87ae943954284bdd89af57a3c4",
	"per-type":     "4b4a07ba4a0dc787f0314902d099497c07716467c137352d54fda40aff2d74a6",
	"options":      "cecdeb7943f37a1fcf194381898f11229a4e83f4176b0ca24abf37e9693805b0",
	"pathological": "af332ebde4d11f48a002e3ca91fd9215d41dbc5387f14d0088b1aac31bd8cfaa",
}

// pinHash writes one redaction into h: the output and every span, length-prefixed.
func pinHash(h hash.Hash, out string, spans []Span) {
	var b [8]byte
	str := func(s string) {
		binary.LittleEndian.PutUint64(b[:], uint64(len(s)))
		h.Write(b[:])
		h.Write([]byte(s))
	}
	num := func(n int) {
		binary.LittleEndian.PutUint64(b[:], uint64(n))
		h.Write(b[:])
	}
	str(out)
	num(len(spans))
	for _, s := range spans {
		num(int(s.Type))
		num(s.Start)
		num(s.End)
		str(s.Placeholder)
		str(s.Text)
	}
}

var (
	pinDemoOnce sync.Once
	pinDemo     []string
)

// demoTexts returns the narratives of the default demo corpus.
func demoTexts() []string {
	pinDemoOnce.Do(func() {
		c := demotown.Generate(demotown.Config{})
		for _, inc := range c.Incidents {
			pinDemo = append(pinDemo, inc.Narrative)
		}
	})
	return pinDemo
}

// oshaTexts returns the OSHA abstracts, or nil when shared/corpora is missing.
func oshaTexts(t testing.TB) []string {
	p := sharedFile("corpora/osha-abstracts/osha.csv")
	if p == "" {
		return nil
	}
	f, err := os.Open(p)
	if err != nil {
		t.Fatal(err)
	}
	defer f.Close()
	rows, err := csv.NewReader(f).ReadAll()
	if err != nil {
		t.Fatal(err)
	}
	col := -1
	for i, h := range rows[0] {
		if h == "Abstract Text" {
			col = i
		}
	}
	if col < 0 {
		t.Fatal("no Abstract Text column")
	}
	var out []string
	for _, row := range rows[1:] {
		out = append(out, row[col])
	}
	return out
}

func genTexts(seed uint64, n int) ([]string, []string) {
	docs, listed := generate(seed, n)
	out := make([]string, len(docs))
	for i, d := range docs {
		out[i] = d.text
	}
	return out, listed
}

// pinCorpora builds the named inputs of the pin test, each a list of (redactor, texts).
func pinCorpora(t *testing.T) map[string]func(h hash.Hash) {
	run := func(r *Redactor, texts []string, again bool) func(h hash.Hash) {
		return func(h hash.Hash) {
			for _, s := range texts {
				out, spans := r.Redact(s)
				if again {
					out, spans = r.Redact(out)
				}
				pinHash(h, out, spans)
			}
		}
	}
	plain := mustNew(t, Options{})
	gen, listed := genTexts(1, 3000)
	bench, blisted := genTexts(2, 500)
	fuzz, flisted := genTexts(3, 40)
	fuzz = append(fuzz, "", "[NAME-1]", "Mr. [NAME-1] Quosby", "Victim Ann Lee, DOB 1/2/90", "plate 12 [NAME-12]",
		"Smith Smith Smith", "call 555-555-0123x", "VIN 1M8GDM9AXKP042788", "Mr. NAME", "ssn 123456789",
		"123 Elm St and 4th Ave / Oak Rd", "a.k.a. Zed", "\xff\xfe Mr. \xff", "Dr. Dr. Dr.")
	osha := oshaTexts(t)
	m := map[string]func(h hash.Hash){
		"demo":       run(plain, demoTexts(), false),
		"demo-again": run(plain, demoTexts(), true),
		"generated":  run(mustNew(t, Options{Names: listed}), gen, false),
		"bench-set":  run(mustNew(t, Options{Names: blisted}), bench, false),
		"fuzz-seeds": run(mustNew(t, Options{Names: append(flisted[:5:5], "Tobin Marsh"), Allow: []string{"Elm"}}), fuzz, false),
		"pathological": run(mustNew(t, Options{Names: []string{"Tobin Marsh"}}), []string{
			strings.Repeat("555 ", 2000), strings.Repeat("a@b.cc ", 1000), strings.Repeat("Mr. Quosby Zed ", 500),
			strings.Repeat("12 Elm St and ", 500), strings.Repeat("1a@", 2000), strings.Repeat("123-45-6789 ", 500),
		}, false),
	}
	if osha != nil {
		m["osha"] = run(plain, osha, false)
		m["osha-caps"] = run(plain, upperAll(osha), false)
	}
	// each detector alone, on part of the corpora, so that a shortcut that depends on
	// which types run is checked too.
	some := append(append(append([]string(nil), demoTexts()[:1500]...), gen[:1000]...), fuzz...)
	if len(osha) > 500 {
		some = append(some, osha[:500]...)
	}
	m["per-type"] = func(h hash.Hash) {
		for _, ty := range AllTypes() {
			run(mustNew(t, Options{Types: Types(ty), Names: listed}), some, false)(h)
		}
	}
	m["options"] = func(h hash.Hash) {
		run(mustNew(t, Options{Names: listed, NoHeuristicNames: true}), some, false)(h)
		run(mustNew(t, Options{Names: listed, Allow: []string{"Elm", "Main St", "Quosby Hardware", listed[0]}}), some, false)(h)
	}
	return m
}

// TestPinnedOutput checks that the redactor's output on the demo corpus, the generated
// test sets and the OSHA abstracts is byte for byte what it was before the speed work.
func TestPinnedOutput(t *testing.T) {
	if testing.Short() {
		t.Skip("short")
	}
	for name, f := range pinCorpora(t) {
		h := sha256.New()
		f(h)
		got := hex.EncodeToString(h.Sum(nil))
		if want := pinned[name]; got != want {
			t.Errorf("%s: output hash %s, pinned %s", name, got, want)
		}
	}
}
