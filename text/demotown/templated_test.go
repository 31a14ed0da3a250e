package demotown

import (
	"bytes"
	"encoding/json"
	"math"
	"strings"
	"testing"
)

// TestTemplateCopies: with TemplateRate, a share of each templated theme's narratives is
// replaced by copies of its family and every other narrative's clean text stays the same as
// in the corpus made without templates (the template stream is separate; noise and HTML
// fall differently once a copy has drawn from their streams); copies keep the
// theme, their spans index the text, and noise and HTML can be undone on them too.
func TestTemplateCopies(t *testing.T) {
	const rate = 0.1
	base := Config{Seed: 4, N: 4000, NoiseRate: 0.3, HTMLRate: 0.2}
	plain := Generate(base)
	cfg := base
	cfg.TemplateRate = rate
	c := Generate(cfg)
	clean := cfg
	clean.NoiseRate, clean.HTMLRate, clean.TypoRate = -1, -1, -1
	cleanC := Generate(clean)
	names, themesOf := TemplateFamilies()
	famTheme := map[string]string{}
	for i, n := range names {
		famTheme[n] = themesOf[i]
	}
	copies := map[string]int{}
	eligible := map[string]int{}
	for i, tr := range c.Truth {
		inc, p := c.Incidents[i], plain.Incidents[i]
		if inc.ID != p.ID || !inc.Reported.Equal(p.Reported) || inc.District != p.District || inc.CallType != p.CallType {
			t.Fatalf("%s: templates changed the record's other fields", tr.ID)
		}
		if tr.Theme != plain.Truth[i].Theme {
			t.Fatalf("%s: theme %s, without templates %s", tr.ID, tr.Theme, plain.Truth[i].Theme)
		}
		if familyOf[themeIndex(tr.Theme)] != nil {
			eligible[tr.Theme]++
		}
		if tr.Template == "" {
			if tr.Restore(inc.Narrative) != plain.Truth[i].Restore(p.Narrative) {
				t.Fatalf("%s: the clean text of a narrative that is no copy changed", tr.ID)
			}
			continue
		}
		copies[tr.Template]++
		if famTheme[tr.Template] != tr.Theme || len(tr.Themes) != 1 || tr.Themes[0].Theme != tr.Theme {
			t.Fatalf("%s: copy of %s with theme %s, themes %+v", tr.ID, tr.Template, tr.Theme, tr.Themes)
		}
		for _, s := range tr.PII {
			if inc.Narrative[s.Start:s.End] != s.Text {
				t.Fatalf("%s: PII span %+v does not index %q", tr.ID, s, inc.Narrative)
			}
		}
		if got := tr.Restore(inc.Narrative); got != cleanC.Incidents[i].Narrative {
			t.Fatalf("%s: restored %q, want %q", tr.ID, got, cleanC.Incidents[i].Narrative)
		}
		if tr.NoPII != (len(tr.PII) == 0) {
			t.Fatalf("%s: NoPII %v with %d spans", tr.ID, tr.NoPII, len(tr.PII))
		}
	}
	for _, n := range names {
		th := famTheme[n]
		// Binomial share: within 4 standard errors (common practice for a generator test).
		p, m := rate, float64(eligible[th])
		got := float64(copies[n]) / m
		if se := math.Sqrt(p * (1 - p) / m); math.Abs(got-p) > 4*se {
			t.Errorf("family %s: %d copies of %d narratives of %s (%.3f), want %.2f ± %.3f", n, copies[n], eligible[th], th, got, p, 4*se)
		}
	}
	// Two copies of one family share most of their words but are not all the same.
	var vp []string
	for i, tr := range cleanC.Truth {
		if tr.Template == "vehicle-prowl-form" {
			vp = append(vp, cleanC.Incidents[i].Narrative)
		}
	}
	distinct := map[string]bool{}
	for _, s := range vp {
		distinct[s] = true
		if !strings.Contains(s, "rear passenger window smashed") {
			t.Errorf("copy without the template's wording: %q", s)
		}
	}
	if len(distinct) < len(vp)*9/10 {
		t.Errorf("%d distinct texts among %d copies: the details do not vary", len(distinct), len(vp))
	}
}

// TestTemplateTruth: the template name and the rate survive truth.jsonl, and a corpus
// made without templates writes neither (its files are unchanged, see TestGolden).
func TestTemplateTruth(t *testing.T) {
	for _, tc := range []struct {
		rate float64
		want bool
	}{{0, false}, {0.2, true}} {
		c := Generate(Config{Seed: 9, N: 400, TemplateRate: tc.rate})
		var csvB, tr bytes.Buffer
		if err := c.WriteTo(&csvB, &tr); err != nil {
			t.Fatal(err)
		}
		if got := bytes.Contains(tr.Bytes(), []byte(`"template`)); got != tc.want {
			t.Errorf("rate %v: truth mentions templates: %v", tc.rate, got)
		}
		i := 0
		h, err := ReadTruth(bytes.NewReader(tr.Bytes()), func(x *Truth) error {
			want, _ := json.Marshal(c.Truth[i])
			got, _ := json.Marshal(x)
			if !bytes.Equal(got, want) {
				t.Errorf("line %d: read back %s, want %s", i+2, got, want)
			}
			i++
			return nil
		})
		if err != nil {
			t.Fatal(err)
		}
		if h.TemplateRate != tc.rate {
			t.Errorf("header template_rate %v, want %v", h.TemplateRate, tc.rate)
		}
	}
}

func themeIndex(name string) int {
	for i, d := range themeDefs {
		if d.name == name {
			return i
		}
	}
	return -1
}
