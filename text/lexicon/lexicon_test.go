package lexicon

import "testing"

// Words and non-words checked by hand: ordinary English words are in (the Snowball sample
// vocabulary holds "clay", "clump", "dosing"), invented demo surnames and OCR-garbled forms
// are not.
func TestHas(t *testing.T) {
	tests := []struct {
		w    string
		has  bool
		comm bool
	}{
		{"vehicle", true, true},
		{"clay", true, false},
		{"clump", true, false},
		{"closing", true, true},
		{"vehic1e", false, false},
		{"rcport", false, false},
		{"westerhold", false, false},
	}
	for _, tt := range tests {
		if got := Has(tt.w); got != tt.has {
			t.Errorf("Has(%q) = %v, want %v", tt.w, got, tt.has)
		}
		if got := Common(tt.w); got != tt.comm {
			t.Errorf("Common(%q) = %v, want %v", tt.w, got, tt.comm)
		}
	}
	if Len() < 40000 {
		t.Errorf("Len() = %d, want the whole list (over 40,000 words)", Len())
	}
}
