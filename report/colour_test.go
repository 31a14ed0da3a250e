package report

import (
	"math"
	"regexp"
	"strconv"
	"testing"
)

func rgb(t *testing.T, hex string) [3]float64 {
	t.Helper()
	if len(hex) != 7 || hex[0] != '#' {
		t.Fatalf("bad colour %q", hex)
	}
	var c [3]float64
	for i := range c {
		v, err := strconv.ParseUint(hex[1+2*i:3+2*i], 16, 8)
		if err != nil {
			t.Fatal(err)
		}
		c[i] = float64(v)
	}
	return c
}

// The palette is Okabe & Ito's as printed in Wong (2011), Nature Methods 8:441, Figure 2
// (RGB values quoted from memory of that figure).
func TestPaletteOkabeIto(t *testing.T) {
	want := [8][3]float64{{0, 0, 0}, {230, 159, 0}, {86, 180, 233}, {0, 158, 115}, {240, 228, 66}, {0, 114, 178}, {213, 94, 0}, {204, 121, 167}}
	for i, hex := range Palette {
		if got := rgb(t, hex); got != want[i] {
			t.Errorf("Palette[%d] = %s = %v, want %v", i, hex, got, want[i])
		}
	}
}

// contrast is the WCAG 2.1 contrast ratio (L1 + 0.05) / (L2 + 0.05) of the relative
// luminances, with sRGB linearisation as defined in WCAG 2.1, "relative luminance".
func contrast(a, b [3]float64) float64 {
	lum := func(c [3]float64) float64 {
		var l [3]float64
		for i, v := range c {
			s := v / 255
			if s <= 0.03928 {
				l[i] = s / 12.92
			} else {
				l[i] = math.Pow((s+0.055)/1.055, 2.4)
			}
		}
		return 0.2126*l[0] + 0.7152*l[1] + 0.0722*l[2]
	}
	l1, l2 := lum(a), lum(b)
	if l1 < l2 {
		l1, l2 = l2, l1
	}
	return (l1 + 0.05) / (l2 + 0.05)
}

// Text colours of the stylesheet meet WCAG 2.1 success criterion 1.4.3 (contrast at
// least 4.5:1 for body text) against the page and card backgrounds.
func TestTextContrast(t *testing.T) {
	// Check the formula first: black on white is 21:1 (WCAG 2.1 definition of contrast ratio).
	if got := contrast([3]float64{0, 0, 0}, [3]float64{255, 255, 255}); math.Abs(got-21) > 1e-9 {
		t.Fatalf("contrast(black, white) = %v, want 21", got)
	}
	css, err := templateFS.ReadFile("templates/style.css.tmpl")
	if err != nil {
		t.Fatal(err)
	}
	vars := map[string]string{}
	for _, m := range regexp.MustCompile(`--([a-z]+): (#[0-9a-fA-F]{6});`).FindAllStringSubmatch(string(css), -1) {
		vars[m[1]] = m[2]
	}
	for _, tc := range []struct{ fg, bg string }{
		{"ink", "paper"}, {"muted", "paper"}, {"blue", "paper"}, {"ink", "card"}, {"muted", "card"}, {"blue", "card"}, {"paper", "ink"},
	} {
		f, b := vars[tc.fg], vars[tc.bg]
		if f == "" || b == "" {
			t.Fatalf("stylesheet lacks --%s or --%s", tc.fg, tc.bg)
		}
		if c := contrast(rgb(t, f), rgb(t, b)); c < 4.5 {
			t.Errorf("--%s on --%s: contrast %.2f, want at least 4.5", tc.fg, tc.bg, c)
		}
	}
}
