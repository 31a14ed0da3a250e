package demotown

import "time"

// Config sets up a corpus. The zero value gives the default demo corpus (seed 0).
type Config struct {
	// Seed seeds the math/rand/v2 PCG streams. Every seed, 0 included, is used as is.
	Seed uint64
	// N is the number of narratives; 0 means 6000.
	N int
	// Months is the number of calendar months covered; 0 means 36.
	Months int
	// Start is the first month (only its year and month in UTC are used); the zero
	// time means January 2023.
	Start time.Time
	// NoiseRate is the share of narratives given OCR-like noise; 0 means 0.10 and a
	// negative value means none.
	NoiseRate float64
	// HTMLRate is the share of narratives given HTML residue; 0 means 0.04 and a
	// negative value means none.
	HTMLRate float64
	// PIIRate is the share of narratives, routine ones excepted, that carry at least one
	// PII span; 0 means 0.6 and a negative value means none.
	PIIRate float64
	// TypoRate is the share of narratives with writers' misspellings ("vehical"),
	// recorded as Noise events of kind Misspelling; 0 means 0.05 and a negative value
	// means none.
	TypoRate float64
	// MixRate is the share of non-routine narratives with sentences from a second theme;
	// 0 means 0.12 and a negative value means none.
	MixRate float64
	// TemplateRate is the share of the narratives of each theme that has a template family
	// (TemplateFamilies) written as a copy of that family: the text one writer pastes into
	// report after report, with a few details changed. Unlike the other rates, 0 means none,
	// so that the corpora made before templates were added stay byte-identical; the demo
	// command uses DemoTemplateRate.
	TemplateRate float64
}

// Default values of Config's zero fields.
const (
	DefaultN         = 6000
	DefaultMonths    = 36
	DefaultNoiseRate = 0.10
	DefaultHTMLRate  = 0.04
	DefaultPIIRate   = 0.6
	DefaultMixRate   = 0.12
	DefaultTypoRate  = 0.05
	// DemoTemplateRate is the TemplateRate of the demo command's corpus.
	DemoTemplateRate = 0.08
)

// DefaultStart is the first month of a corpus whose Config.Start is zero.
var DefaultStart = time.Date(2023, time.January, 1, 0, 0, 0, 0, time.UTC)

func rate(v, def float64, name string) float64 {
	switch {
	case v == 0:
		return def
	case v < 0:
		return 0
	case v > 1:
		panic("demotown: " + name + " above 1")
	}
	return v
}

// resolved returns c with its defaults filled in. It panics on a negative N or Months or
// a rate above 1 (caller bugs).
func (c Config) resolved() Config {
	if c.N < 0 || c.Months < 0 {
		panic("demotown: negative N or Months")
	}
	if c.N == 0 {
		c.N = DefaultN
	}
	if c.Months == 0 {
		c.Months = DefaultMonths
	}
	if c.Start.IsZero() {
		c.Start = DefaultStart
	}
	y, m, _ := c.Start.UTC().Date()
	c.Start = time.Date(y, m, 1, 0, 0, 0, 0, time.UTC)
	c.NoiseRate = rate(c.NoiseRate, DefaultNoiseRate, "NoiseRate")
	c.HTMLRate = rate(c.HTMLRate, DefaultHTMLRate, "HTMLRate")
	c.PIIRate = rate(c.PIIRate, DefaultPIIRate, "PIIRate")
	c.MixRate = rate(c.MixRate, DefaultMixRate, "MixRate")
	c.TypoRate = rate(c.TypoRate, DefaultTypoRate, "TypoRate")
	c.TemplateRate = rate(c.TemplateRate, 0, "TemplateRate")
	return c
}

// AppearMonth is the first month index (0-based) of the Appearing theme for a corpus of
// the given number of months: 2/3 of the way through, month 24 of 36.
func AppearMonth(months int) int { return months * 2 / 3 }
