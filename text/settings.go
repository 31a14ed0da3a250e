package text

import (
	"fmt"

	"undercurrent/text/phrase"
	"undercurrent/text/routine"
	"undercurrent/text/sentences"
	"undercurrent/text/weight"
)

// Policy says what happens to tokens of a non-word kind.
type Policy string

const (
	Drop        Policy = "drop"        // the token is removed (the zero value "" means Drop too)
	Keep        Policy = "keep"        // the token is kept as written, protected
	Placeholder Policy = "placeholder" // the token becomes "_number_", "_time_", "_date_" or "_code_", protected
)

// SettingsVersion is the version written into Settings by DefaultSettings. Version 2 added
// Sentences; settings of version 1 (saved with older models) have it zero, which is off, so
// they process text exactly as before.
const SettingsVersion = 2

// Settings hold every choice the text pipeline makes. One value is saved with every model
// (it is JSON-serialisable), so that tagging new narratives later repeats exactly the same
// processing. Zero values are documented on each field; DefaultSettings gives the values we
// recommend.
type Settings struct {
	Version int             `json:"version"` // SettingsVersion; zero is read as 1
	Tokens  TokenSettings   `json:"tokens"`
	Abbrev  AbbrevSettings  `json:"abbreviations"`
	Stop    StopSettings    `json:"stopwords"`
	Stem    StemSettings    `json:"stemming"`
	Repair  RepairSettings  `json:"repair"`
	Phrases PhraseSettings  `json:"phrases"`
	Vocab   weight.Pruning  `json:"vocabulary"`
	Weight  weight.Scheme   `json:"weighting"`
	Routine RoutineSettings `json:"routine"`
	// Sentences sets aside boilerplate sentences (version 2; absent, and off, in version 1).
	Sentences SentenceSettings `json:"sentences,omitzero"`
}

// SentenceSettings choose which repeated sentences are kept out of the counts (package
// sentences cuts and keys them). A sentence of at least MinTokens tokens whose key is found in
// at least Threshold() narratives is boilerplate; with Repeats, so is the second and every
// later occurrence of a sentence within one narrative. Their tokens are left out of the
// counts (a break stands in their place, so no phrase or split-word join spans them); the
// text, its offsets and everything shown from it are unchanged. Zero numeric values mean the
// defaults given.
type SentenceSettings struct {
	Enabled bool `json:"enabled"` // zero (false): off; DefaultSettings leaves it off
	// MinNarratives: least number of narratives holding the key; zero means 20.
	MinNarratives int `json:"min_narratives"`
	// MinShare: least share of the narratives holding the key (rounded up); zero means 0.005.
	MinShare float64 `json:"min_share"`
	// MinTokens: shorter sentences are never set aside ("Yes."); zero means 2.
	MinTokens int `json:"min_tokens"`
	// Repeats also sets aside exact repeats of a sentence within one narrative (pasted twice);
	// zero (false): off. The command turns it on with the step.
	Repeats bool `json:"repeats"`
}

// Threshold is the number of narratives (of docs) a sentence's key must be found in to be
// boilerplate: the larger of MinNarratives and MinShare·docs rounded up, and at least 2.
func (s SentenceSettings) Threshold(docs int) int {
	return sentences.Threshold(docs, orInt(s.MinNarratives, 20), orFloat(s.MinShare, 0.005))
}

func (s SentenceSettings) minTokens() int { return orInt(s.MinTokens, 2) }

// Resolved returns s with every zero numeric value replaced by its default.
func (s SentenceSettings) Resolved() SentenceSettings {
	s.MinNarratives, s.MinShare, s.MinTokens = orInt(s.MinNarratives, 20), orFloat(s.MinShare, 0.005), s.minTokens()
	return s
}

// TokenSettings are the token policies.
type TokenSettings struct {
	Numbers Policy `json:"numbers"` // zero: Drop
	Times   Policy `json:"times"`   // zero: Drop
	Dates   Policy `json:"dates"`   // zero: Drop
	Codes   Policy `json:"codes"`   // zero: Drop (DefaultSettings keeps them: "10-50" means something)
	// MinLength drops unprotected words shorter than this many characters (after abbreviation
	// expansion); zero keeps all.
	MinLength int `json:"min_length"`
	// KeepPossessive keeps a trailing "'s"; zero (false) strips it ("driver's" → "driver").
	KeepPossessive bool `json:"keep_possessive"`
}

// AbbrevSettings choose the abbreviation table.
type AbbrevSettings struct {
	// NoShipped leaves out the shipped table; zero (false) uses it.
	NoShipped bool `json:"no_shipped"`
	// User entries add to or override the shipped table; an empty expansion removes an entry.
	// Read them with ParseAbbrev. Nil: none.
	User map[string]string `json:"user,omitempty"`
}

// StopSettings choose the stopwords.
type StopSettings struct {
	// Lists are names for stopwords.Named ("en", "boilerplate"); nil: no embedded list.
	Lists []string `json:"lists"`
	// User words are added (read a file with stopwords.Set.Load); nil: none.
	User []string `json:"user,omitempty"`
	// Keep words are never stopped, even when a list holds them; nil: none.
	Keep []string `json:"keep,omitempty"`
}

// StemSettings choose stemming.
type StemSettings struct {
	Off bool `json:"off"` // zero (false): Snowball English stemming is on
}

// RepairSettings choose OCR-noise repair (package repair). Zero numeric values mean the
// defaults given.
type RepairSettings struct {
	Enabled bool `json:"enabled"` // zero (false): no repair
	// RareMax: words seen at most this many times in the corpus may be repaired; zero means 2.
	RareMax int `json:"rare_max"`
	// RareRatio: a word seen more often than RareMax (but less than FrequentMin) may be
	// repaired when its target is seen at least RareRatio times as often (OCR repeats its
	// mistakes); zero means 50, negative switches this rule off.
	RareRatio float64 `json:"rare_ratio"`
	// FrequentMin: targets (and rejoined split words) must be seen at least this many times;
	// zero means 10.
	FrequentMin int `json:"frequent_min"`
	// MaxCost is the largest weighted distance accepted for words longer than ShortLen
	// characters; zero means 1. At most 1 is useful (package repair finds no candidate
	// further away). DefaultSettings uses 0.5, one OCR confusion: on the OSHA abstracts
	// (typed text) a limit of 1 also "corrected" real words such as overheard → overhead.
	MaxCost float64 `json:"max_cost"`
	// ShortMaxCost is the limit for words of at most ShortLen characters; zero means 0.5 (one
	// OCR confusion), since a short word one plain edit from a frequent word is often a word.
	ShortMaxCost float64 `json:"short_max_cost"`
	ShortLen     int     `json:"short_len"` // zero means 8
	// MinLength: shorter words are never repaired; zero means 4.
	MinLength int `json:"min_length"`
	// Words are extra correct words: targets of repair and never repaired themselves.
	Words []string `json:"words,omitempty"`
	// Families also repairs words that have another inflection in the corpus; zero (false)
	// leaves them alone, taking them for real words ("clump" beside "clumped").
	Families bool `json:"families"`
	// NoJoin switches off rejoining split words ("veh icle" → "vehicle"); zero: on.
	NoJoin bool `json:"no_join"`
	// KeepKnown leaves alone every word of the English word list (package lexicon), however
	// rare in the corpus: on typed exports such as the OSHA abstracts, repair otherwise
	// "corrected" real words (clay → day, dosing → closing). Zero (false): off;
	// DefaultSettings turns it on.
	KeepKnown bool `json:"keep_known"`
}

// PhraseSettings choose collocation detection.
type PhraseSettings struct {
	Enabled bool `json:"enabled"` // zero (false): no phrases
	phrase.Settings
}

// RoutineSettings say which narratives are set aside as routine.
type RoutineSettings struct {
	// MaxContent: a narrative with at most this many content tokens (after stopwords) is
	// routine, whatever they are. A narrative with none is always routine. Zero: only those.
	// Beware that short narratives can matter ("shots fired"): DefaultSettings uses zero and
	// relies on Words.
	MaxContent int `json:"max_content"`
	// Words are routine words (as written, e.g. "gone", "arrival"; compared by stem after
	// abbreviation expansion and stopwords); a narrative whose content tokens are all routine
	// words is routine ("GOA", "UTL, area checked, all quiet"). Nil: this rule is off.
	Words []string `json:"words,omitempty"`
	// NearDup sets aside groups of at least MinGroup exact or near-duplicate narratives.
	NearDup  bool `json:"near_dup"`
	MinGroup int  `json:"min_group"` // zero means 3
	// MinDupContent: a narrative with fewer content tokens is short; short narratives
	// coincide by chance ("dog bit a child at 3rd Ave"), so a short one is set aside as a
	// duplicate only in a group of at least MinShortGroup. Zero means 8.
	MinDupContent int `json:"min_dup_content"`
	MinShortGroup int `json:"min_short_group"` // zero means 10
	routine.Settings
}

// DefaultSettings returns the recommended settings.
func DefaultSettings() Settings {
	return Settings{
		Version: SettingsVersion,
		Tokens:  TokenSettings{Numbers: Drop, Times: Drop, Dates: Drop, Codes: Keep, MinLength: 2},
		Stop:    StopSettings{Lists: []string{"en", "boilerplate"}},
		Repair:  RepairSettings{Enabled: true, RareMax: 2, RareRatio: 50, FrequentMin: 10, MaxCost: 0.5, ShortMaxCost: 0.5, ShortLen: 8, MinLength: 4, KeepKnown: true},
		Phrases: PhraseSettings{Enabled: true, Settings: phrase.Settings{MinCount: 5, MinLLR: 10.83}},
		Vocab:   weight.Pruning{MinDocs: 2, MaxDocShare: 0.95},
		Weight:  weight.Scheme{TF: weight.TFRaw, IDF: weight.IDFSmooth, Norm: weight.NormL2},
		Routine: RoutineSettings{
			// Dispositions that say nothing happened (common practice, written from memory).
			Words: []string{"gone", "arrival", "unable", "locate", "located", "action", "cleared", "clear", "cancelled",
				"canceled", "cancel", "negative", "contact", "duplicate", "test", "checked", "check", "area", "secure",
				"secured", "quiet", "okay", "ok", "nothing", "found", "unfounded", "answer", "voicemail", "message",
				"callback", "disregard", "handled", "referred", "results", "drove", "drive", "patrol", "patrolled",
				"neighborhood", "vicinity", "block", "twice", "needed", "prior", "suspicious", "matching", "description",
				"make", "made", "caller", "one", "signs", "sign", "activity", "seen", "report", "upon",
				"remained", "returned", "service", "complainant", "searched", "search", "extra", "requested", "heard"},
			NearDup:       true,
			MinGroup:      3,
			MinDupContent: 8,
			MinShortGroup: 10,
			Settings:      routine.Settings{Shingle: 3, Hashes: 32, Bands: 8, Threshold: 0.8, Seed: 1},
		},
		// Sentences stays off (zero): on the demo corpus, whose themes repeat their own
		// sentences word for word, setting repeated sentences aside cost theme quality (see
		// the README); switch it on with Sentences.Enabled (and Repeats).
	}
}

// Validate reports settings that cannot be used.
func (s Settings) Validate() error {
	if s.Version > SettingsVersion {
		return fmt.Errorf("text: settings version %d is newer than this program (%d)", s.Version, SettingsVersion)
	}
	for _, p := range []Policy{s.Tokens.Numbers, s.Tokens.Times, s.Tokens.Dates, s.Tokens.Codes} {
		switch p {
		case "", Drop, Keep, Placeholder:
		default:
			return fmt.Errorf("text: unknown token policy %q (use drop, keep or placeholder)", p)
		}
	}
	if err := s.Weight.Validate(); err != nil {
		return err
	}
	r := s.Routine.Settings
	h, b := r.Hashes, r.Bands
	if h == 0 {
		h = 64
	}
	if b == 0 {
		b = 16
	}
	if h < 0 || b < 0 || h&(h-1) != 0 {
		return fmt.Errorf("text: routine hashes (%d) must be a power of two", h)
	}
	if h%b != 0 {
		return fmt.Errorf("text: routine bands (%d) must divide hashes (%d)", b, h)
	}
	if ss := s.Sentences; ss.MinNarratives < 0 || ss.MinTokens < 0 || ss.MinShare < 0 || ss.MinShare > 1 {
		return fmt.Errorf("text: sentences min_narratives (%d) and min_tokens (%d) must not be negative, min_share (%v) must be in [0,1]", ss.MinNarratives, ss.MinTokens, ss.MinShare)
	}
	if s.Vocab.MaxDocShare < 0 || s.Vocab.MaxDocShare > 1 {
		return fmt.Errorf("text: vocabulary max_doc_share %v outside [0,1]", s.Vocab.MaxDocShare)
	}
	return nil
}

func orInt(v, d int) int {
	if v <= 0 {
		return d
	}
	return v
}

func orFloat(v, d float64) float64 {
	if v <= 0 {
		return d
	}
	return v
}
