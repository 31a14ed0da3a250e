package repair

import (
	"bytes"
	"strings"
	"testing"
)

// Expected distances follow from the cost table in the package comment (hand-computed).
func TestDistance(t *testing.T) {
	tests := []struct {
		a, b string
		want float64
	}{
		{"vehicle", "vehicle", 0},
		{"veh1cle", "vehicle", 0.5}, // 1/i
		{"0fficer", "officer", 0.5}, // 0/o
		{"5uspect", "suspect", 0.5}, // 5/s
		{"rnale", "male", 0.5},      // rn/m
		{"rnodern", "modern", 0.5},  // rn/m
		{"clriver", "driver", 0.5},  // cl/d
		{"vehilce", "vehicle", 1},   // transposition
		{"vehicel", "vehicle", 1},   // transposition
		{"vehcle", "vehicle", 1},    // deletion
		{"vehixle", "vehicle", 1},   // substitution
		{"kitten", "sitting", 3},    // Levenshtein's classic example
		{"ca", "abc", 3},            // OSA (not unrestricted DL, which gives 2)
	}
	for _, tt := range tests {
		if got := Distance(tt.a, tt.b); got != tt.want {
			t.Errorf("Distance(%q, %q) = %v, want %v", tt.a, tt.b, got, tt.want)
		}
		if got := Distance(tt.b, tt.a); got != tt.want {
			t.Errorf("Distance(%q, %q) = %v, want %v (symmetry)", tt.b, tt.a, got, tt.want)
		}
	}
}

func TestBest(t *testing.T) {
	ix := NewIndex([]string{"vehicle", "officer", "suspect", "male", "mile", "driver"})
	tests := []struct {
		w    string
		max  float64
		want string
		ok   bool
	}{
		{"veh1cle", 1, "vehicle", true},
		{"0fficer", 0.5, "officer", true},
		{"rnale", 1, "male", true}, // male 0.5, mile 1.5
		{"mble", 1, "", false},     // male and mile both 1: ambiguous
		{"vehicle", 1, "", false},  // itself
		{"zzzz", 1, "", false},
		{"vehilce", 0.5, "", false}, // cost 1 above limit
	}
	for _, tt := range tests {
		got, _, ok := ix.Best(tt.w, tt.max)
		if got != tt.want || ok != tt.ok {
			t.Errorf("Best(%q) = %q, %v; want %q, %v", tt.w, got, ok, tt.want, tt.ok)
		}
	}
}

func TestWriteCSV(t *testing.T) {
	var b bytes.Buffer
	err := WriteCSV(&b, []Correction{{From: "veh1cle", To: "vehicle", Kind: "ocr", Cost: 0.5, Count: 2}, {From: "veh icle", To: "vehicle", Kind: "join", Count: 1}})
	if err != nil {
		t.Fatal(err)
	}
	want := "kind,from,to,cost,count\nocr,veh1cle,vehicle,0.5,2\njoin,veh icle,vehicle,0,1\n"
	if b.String() != want {
		t.Errorf("got %q", b.String())
	}
}

// A canonical-only index finds the same confusion-only matches as the full one.
func TestIndexLimit(t *testing.T) {
	targets := []string{"vehicle", "officer", "suspect", "male", "mile", "driver", "modern", "clear"}
	full, small := NewIndex(targets), NewIndexLimit(targets, 0.5)
	for _, w := range []string{"veh1cle", "0fficer", "5uspect", "rnale", "rnodern", "ciear", "elear", "vehilce", "mble", "zzzz"} {
		a, ca, oka := full.Best(w, 0.5)
		b, cb, okb := small.Best(w, 0.5)
		if a != b || ca != cb || oka != okb {
			t.Errorf("%q: full %q %v %v, canonical-only %q %v %v", w, a, ca, oka, b, cb, okb)
		}
	}
}

// The byte path of keys (ASCII words) gives the same keys, in the same order, as the rune
// path, on seeded random words over the OCR-confusable letters and digits.
func TestKeysASCIIMatchesRunes(t *testing.T) {
	const alpha = "rnclvvv015ieabsmdwo"
	x := uint64(1)
	for _, canonOnly := range []bool{true, false} {
		ix := &Index{canonOnly: canonOnly}
		for i := 0; i < 20000; i++ {
			var b []byte
			for k := 1 + i%12; k > 0; k-- {
				x = x*6364136223846793005 + 1442695040888963407
				b = append(b, alpha[(x>>33)%uint64(len(alpha))])
			}
			w := string(b)
			var got, want []string
			ix.keys(w, func(k []byte) { got = append(got, string(k)) })
			ix.keysRunes(w, func(k []byte) { want = append(want, string(k)) })
			if strings.Join(got, ",") != strings.Join(want, ",") {
				t.Fatalf("%q: keys %q, rune path %q", w, got, want)
			}
		}
	}
}
