package report

import (
	"strings"
	"testing"
)

// Expected segments worked out by hand from the byte offsets (é is 2 bytes in UTF-8).
func TestHighlight(t *testing.T) {
	text := "Car parked on the driveway; café owner"
	for _, tc := range []struct {
		name  string
		spans []Span
		want  string // hits in [brackets]
		err   string
	}{
		{"none", nil, "Car parked on the driveway; café owner", ""},
		{"two words", []Span{{18, 26}, {4, 10}}, "Car [parked] on the [driveway]; café owner", ""},
		{"overlap and touch", []Span{{4, 8}, {6, 10}, {10, 13}}, "Car [parked on] the driveway; café owner", ""},
		{"nested", []Span{{0, 10}, {4, 6}}, "[Car parked] on the driveway; café owner", ""},
		{"whole", []Span{{0, len(text)}}, "[Car parked on the driveway; café owner]", ""},
		{"multibyte", []Span{{28, 33}}, "Car parked on the driveway; [café] owner", ""},
		{"empty span", []Span{{5, 5}}, "Car parked on the driveway; café owner", ""},
		{"cuts é", []Span{{28, 32}}, "", "cuts a UTF-8 character"},
		{"outside", []Span{{30, 99}}, "", "outside the text"},
		{"reversed", []Span{{8, 4}}, "", "outside the text (39 bytes) or reversed"},
	} {
		segs, err := Highlight(text, tc.spans)
		if tc.err != "" {
			if err == nil || !strings.Contains(err.Error(), tc.err) {
				t.Errorf("%s: error %v, want %q", tc.name, err, tc.err)
			}
			continue
		}
		if err != nil {
			t.Errorf("%s: %v", tc.name, err)
			continue
		}
		var b strings.Builder
		for i, s := range segs {
			if s.Text == "" {
				t.Errorf("%s: empty segment %d", tc.name, i)
			}
			if i > 0 && s.Hit == segs[i-1].Hit {
				t.Errorf("%s: segments %d and %d not merged", tc.name, i-1, i)
			}
			if s.Hit {
				b.WriteString("[" + s.Text + "]")
			} else {
				b.WriteString(s.Text)
			}
		}
		if b.String() != tc.want {
			t.Errorf("%s: got %q, want %q", tc.name, b.String(), tc.want)
		}
	}
}
