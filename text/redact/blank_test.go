package redact

import "testing"

// Blank keeps every byte offset: the output has the input's length and differs only where a
// placeholder stood (placeholder grammar: this package's own, see placeholderRe).
func TestBlank(t *testing.T) {
	tests := []struct{ in, want string }{
		{"no placeholders", "no placeholders"},
		{"Mr. [NAME-1] at [ADDRESS].", "Mr.          at          ."},
		{"[PHONE][EMAIL]", "              "},
		{"[NOT-ONE] [NAME-x]", "[NOT-ONE] [NAME-x]"},
	}
	for _, tt := range tests {
		got := Blank(tt.in)
		if got != tt.want || len(got) != len(tt.in) {
			t.Errorf("Blank(%q) = %q, want %q", tt.in, got, tt.want)
		}
	}
}
