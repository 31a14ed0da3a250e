package demotown

import (
	"bufio"
	"encoding/csv"
	"encoding/json"
	"errors"
	"fmt"
	"io"
	"maps"
	"os"
	"path/filepath"
	"sort"
	"strconv"
	"strings"
	"time"
)

// Incident is one row of incidents.csv.
type Incident struct {
	ID        string    // incident_id, "QM23-000001": year and a per-year sequence
	Reported  time.Time // reported, UTC, whole minutes
	District  string    // one of Districts
	CallType  string    // call_type
	Unit      string    // officer_unit, "3B27"
	Narrative string
}

// ReportedLayout is the time layout of the reported column (M/D/YYYY h:mm AM/PM).
const ReportedLayout = "1/2/2006 3:04 PM"

// Header is the header row of incidents.csv (read only).
var Header = []string{"incident_id", "reported", "district", "call_type", "narrative", "officer_unit"}

// ThemeShare says how many of a narrative's sentences came from a theme.
type ThemeShare struct {
	Theme     string `json:"theme"`
	Sentences int    `json:"sentences"`
}

// Span is one planted PII value: Narrative[Start:End] == Text (byte offsets). Cue is the
// lower-cased text of up to two tokens before it in its sentence ("" at a sentence start).
type Span struct {
	Type  string `json:"type"`
	Start int    `json:"start"`
	End   int    `json:"end"`
	Text  string `json:"text"`
	Cue   string `json:"cue"`
}

// NoiseEvent is one planted OCR error: Narrative[Start:End] == Noisy, which stands for the
// word Original.
type NoiseEvent struct {
	Kind     string `json:"kind"`
	Start    int    `json:"start"`
	End      int    `json:"end"`
	Noisy    string `json:"noisy"`
	Original string `json:"original"`
}

// HTMLEvent is one piece of planted HTML residue: Narrative[Start:End] == Residue, which
// decodes to Decoded ("" for <p> and </p>, "\n" for <br />, U+00A0 for &nbsp;, "&" for
// &amp;, U+2019 for &rsquo; and itself) and replaced Original, the clean text ("", "and",
// "'", or the space, two spaces or line break between two words or sentences).
type HTMLEvent struct {
	Start    int    `json:"start"`
	End      int    `json:"end"`
	Residue  string `json:"residue"`
	Decoded  string `json:"decoded"`
	Original string `json:"original"`
}

// Abbrev is one abbreviation written in a narrative: Narrative[Start:End] == Text.
type Abbrev struct {
	Start     int    `json:"start"`
	End       int    `json:"end"`
	Text      string `json:"text"`
	Expansion string `json:"expansion"`
}

// Truth is the ground truth of one narrative. Its slices are never nil.
type Truth struct {
	ID     string       `json:"id"`
	Month  int          `json:"month"` // 0-based month index
	Theme  string       `json:"theme"` // the primary theme
	Themes []ThemeShare `json:"themes"`
	// Template names the planted template family the narrative is a copy of (see
	// Config.TemplateRate); empty for the others.
	Template        string       `json:"template,omitempty"`
	CallTypeMatches bool         `json:"call_type_matches"` // call_type is one of the theme's
	NoPII           bool         `json:"no_pii"`
	PII             []Span       `json:"pii"`
	Noise           []NoiseEvent `json:"noise"`
	HTML            []HTMLEvent  `json:"html"`
	Abbrevs         []Abbrev     `json:"abbrevs"`
}

// Restore returns narrative, the text t describes, with every noise and HTML event undone:
// the clean text the generator wrote before planting them.
func (t *Truth) Restore(narrative string) string {
	type edit struct {
		start, end int
		repl       string
	}
	eds := make([]edit, 0, len(t.Noise)+len(t.HTML))
	for _, z := range t.Noise {
		eds = append(eds, edit{z.Start, z.End, z.Original})
	}
	for _, h := range t.HTML {
		eds = append(eds, edit{h.Start, h.End, h.Original})
	}
	sort.Slice(eds, func(a, b int) bool { return eds[a].start < eds[b].start })
	var b strings.Builder
	at := 0
	for _, e := range eds {
		b.WriteString(narrative[at:e.start])
		b.WriteString(e.repl)
		at = e.end
	}
	b.WriteString(narrative[at:])
	return b.String()
}

// ThemeInfo describes a planted theme.
type ThemeInfo struct {
	Name      string    `json:"name"`
	Label     string    `json:"label"`
	Trend     Trend     `json:"trend"`
	District  string    `json:"district"`   // the district that holds 60% of its narratives
	CallTypes []string  `json:"call_types"` // the call types that agree with it
	Monthly   []float64 `json:"monthly"`    // probability of the theme in each month
}

// Corpus is a generated corpus held in memory.
type Corpus struct {
	Config    Config // with defaults filled in
	Incidents []Incident
	Truth     []Truth
	Themes    []ThemeInfo
}

// Themes returns the planted themes and their per-month probabilities for cfg.
func Themes(cfg Config) []ThemeInfo {
	cfg = cfg.resolved()
	mp := monthlyProbs(cfg)
	out := make([]ThemeInfo, len(themeDefs))
	for i, d := range themeDefs {
		out[i] = ThemeInfo{Name: d.name, Label: d.label, Trend: d.trend, District: Districts[d.district], CallTypes: d.callTypes}
		out[i].Monthly = make([]float64, cfg.Months)
		for m := range mp {
			out[i].Monthly[m] = mp[m][i]
		}
	}
	return out
}

// Abbreviations returns a copy of the table of abbreviations the corpus writes (lower
// case, no trailing period) and their expansions; Abbrev.Expansion comes from it.
func Abbreviations() map[string]string { return maps.Clone(abbrevs) }

// MonthCounts returns the number of narratives in each month for cfg.
func MonthCounts(cfg Config) []int { return monthCounts(cfg.resolved()) }

// Generate returns the corpus cfg describes, in memory (about 1 KB per narrative; use
// Stream for large N).
func Generate(cfg Config) *Corpus {
	g := newGenerator(cfg)
	c := &Corpus{Config: g.cfg, Themes: Themes(cfg)}
	c.Incidents = make([]Incident, 0, g.cfg.N)
	c.Truth = make([]Truth, 0, g.cfg.N)
	for i := 0; i < g.cfg.N; i++ {
		inc, tr := g.next()
		c.Incidents = append(c.Incidents, inc)
		c.Truth = append(c.Truth, tr)
	}
	return c
}

// Stream writes the corpus cfg describes as CSV to w and as JSON Lines to truth (which may
// be nil), one narrative at a time, in memory that does not grow with N. The output is
// byte-identical to Corpus.WriteDir's incidents.csv and truth.jsonl.
func Stream(w io.Writer, truth io.Writer, cfg Config) error {
	g := newGenerator(cfg)
	bw := bufio.NewWriterSize(w, 1<<16)
	cw := csv.NewWriter(bw)
	var tw *bufio.Writer
	if truth != nil {
		tw = bufio.NewWriterSize(truth, 1<<16)
		if err := writeTruthHeader(tw, g.cfg, Themes(cfg)); err != nil {
			return err
		}
	}
	if err := cw.Write(Header); err != nil {
		return err
	}
	var rec [6]string
	var line []byte
	for i := 0; i < g.cfg.N; i++ {
		inc, tr := g.next()
		if err := cw.Write(inc.record(rec[:])); err != nil {
			return err
		}
		if tw != nil {
			line = appendTruth(line[:0], &tr)
			if _, err := tw.Write(line); err != nil {
				return err
			}
		}
	}
	cw.Flush()
	if err := cw.Error(); err != nil {
		return err
	}
	if err := bw.Flush(); err != nil {
		return err
	}
	if tw != nil {
		return tw.Flush()
	}
	return nil
}

func (inc *Incident) record(dst []string) []string {
	dst[0], dst[1], dst[2], dst[3], dst[4], dst[5] = inc.ID, inc.Reported.Format(ReportedLayout), inc.District, inc.CallType, inc.Narrative, inc.Unit
	return dst
}

// WriteTo writes the corpus's incidents.csv and truth.jsonl contents to w and truth.
func (c *Corpus) WriteTo(w, truth io.Writer) error {
	bw := bufio.NewWriter(w)
	cw := csv.NewWriter(bw)
	if err := cw.Write(Header); err != nil {
		return err
	}
	var rec [6]string
	for i := range c.Incidents {
		if err := cw.Write(c.Incidents[i].record(rec[:])); err != nil {
			return err
		}
	}
	cw.Flush()
	if err := cw.Error(); err != nil {
		return err
	}
	if err := bw.Flush(); err != nil {
		return err
	}
	if truth == nil {
		return nil
	}
	tw := bufio.NewWriter(truth)
	if err := writeTruthHeader(tw, c.Config, c.Themes); err != nil {
		return err
	}
	var line []byte
	for i := range c.Truth {
		line = appendTruth(line[:0], &c.Truth[i])
		if _, err := tw.Write(line); err != nil {
			return err
		}
	}
	return tw.Flush()
}

// File names written by WriteDir and StreamDir.
const (
	IncidentsFile = "incidents.csv"
	TruthFile     = "truth.jsonl"
)

// WriteDir writes incidents.csv and truth.jsonl into dir, creating it if needed.
func (c *Corpus) WriteDir(dir string) error {
	return writeDir(dir, func(w, t io.Writer) error { return c.WriteTo(w, t) })
}

// StreamDir is Stream into dir/incidents.csv and dir/truth.jsonl.
func StreamDir(dir string, cfg Config) error {
	return writeDir(dir, func(w, t io.Writer) error { return Stream(w, t, cfg) })
}

func writeDir(dir string, write func(w, t io.Writer) error) (err error) {
	if err := os.MkdirAll(dir, 0o755); err != nil {
		return fmt.Errorf("demotown: %w", err)
	}
	f, err := os.Create(filepath.Join(dir, IncidentsFile))
	if err != nil {
		return fmt.Errorf("demotown: %w", err)
	}
	defer func() {
		if cerr := f.Close(); err == nil && cerr != nil {
			err = fmt.Errorf("demotown: %w", cerr)
		}
	}()
	t, err := os.Create(filepath.Join(dir, TruthFile))
	if err != nil {
		return fmt.Errorf("demotown: %w", err)
	}
	defer func() {
		if cerr := t.Close(); err == nil && cerr != nil {
			err = fmt.Errorf("demotown: %w", cerr)
		}
	}()
	if err := write(f, t); err != nil {
		return fmt.Errorf("demotown: %w", err)
	}
	return nil
}

// TruthHeader is the first line of truth.jsonl: the settings the corpus was made with and
// the planted themes.
type TruthHeader struct {
	Record      string  `json:"record"` // "corpus"
	Town        string  `json:"town"`
	Seed        uint64  `json:"seed"`
	N           int     `json:"n"`
	Months      int     `json:"months"`
	Start       string  `json:"start"` // YYYY-MM
	AppearMonth int     `json:"appear_month"`
	MonthCounts []int   `json:"month_counts"`
	NoiseRate   float64 `json:"noise_rate"`
	HTMLRate    float64 `json:"html_rate"`
	PIIRate     float64 `json:"pii_rate"`
	MixRate     float64 `json:"mix_rate"`
	TypoRate    float64 `json:"typo_rate"`
	// TemplateRate is Config.TemplateRate; absent (0) when no templates were planted.
	TemplateRate float64     `json:"template_rate,omitempty"`
	Offsets      string      `json:"offsets"`
	Districts    []string    `json:"districts"`
	Themes       []ThemeInfo `json:"themes"`
}

func writeTruthHeader(w io.Writer, cfg Config, th []ThemeInfo) error {
	b, err := json.Marshal(TruthHeader{
		Record: "corpus", Town: TownName, Seed: cfg.Seed, N: cfg.N, Months: cfg.Months,
		Start: cfg.Start.Format("2006-01"), AppearMonth: AppearMonth(cfg.Months), MonthCounts: monthCounts(cfg),
		NoiseRate: cfg.NoiseRate, HTMLRate: cfg.HTMLRate, PIIRate: cfg.PIIRate, MixRate: cfg.MixRate, TypoRate: cfg.TypoRate,
		TemplateRate: cfg.TemplateRate,
		Offsets:      "byte offsets [start,end) into the narrative field as decoded from the CSV (UTF-8)",
		Districts:    Districts, Themes: th,
	})
	if err != nil {
		return err
	}
	_, err = w.Write(append(b, '\n'))
	return err
}

// ReadTruth reads a truth.jsonl stream: it returns the header and calls each, if not nil,
// for every narrative's truth in order, stopping at the first error each returns. Memory
// does not grow with the number of lines.
func ReadTruth(r io.Reader, each func(*Truth) error) (TruthHeader, error) {
	var h TruthHeader
	sc := bufio.NewScanner(r)
	sc.Buffer(make([]byte, 0, 1<<16), 64<<20)
	line := 0
	for sc.Scan() {
		line++
		if line == 1 {
			if err := json.Unmarshal(sc.Bytes(), &h); err != nil || h.Record != "corpus" {
				if err == nil {
					err = errors.New(`not a "corpus" record`)
				}
				return h, fmt.Errorf("demotown: truth line 1: %w", err)
			}
			continue
		}
		var t Truth
		if err := json.Unmarshal(sc.Bytes(), &t); err != nil {
			return h, fmt.Errorf("demotown: truth line %d: %w", line, err)
		}
		if each != nil {
			if err := each(&t); err != nil {
				return h, err
			}
		}
	}
	if err := sc.Err(); err != nil {
		return h, fmt.Errorf("demotown: truth line %d: %w", line+1, err)
	}
	if line == 0 {
		return h, errors.New("demotown: empty truth file")
	}
	return h, nil
}

// appendJSONString appends s as a JSON string (the generator writes ASCII, U+00A0 and
// U+2019 only; other bytes pass through unchanged, which is valid UTF-8 JSON).
func appendJSONString(dst []byte, s string) []byte {
	const hex = "0123456789abcdef"
	dst = append(dst, '"')
	for i := 0; i < len(s); i++ {
		c := s[i]
		switch {
		case c == '"' || c == '\\':
			dst = append(dst, '\\', c)
		case c == '\n':
			dst = append(dst, '\\', 'n')
		case c < 0x20:
			dst = append(dst, '\\', 'u', '0', '0', hex[c>>4], hex[c&15])
		case c == '<' || c == '>' || c == '&':
			// Escaped as encoding/json does, so the two encoders agree byte for byte.
			dst = append(dst, '\\', 'u', '0', '0', hex[c>>4], hex[c&15])
		default:
			dst = append(dst, c)
		}
	}
	return append(dst, '"')
}

func appendKey(dst []byte, k string) []byte {
	dst = append(dst, '"')
	dst = append(dst, k...)
	return append(dst, '"', ':')
}

func appendSE(dst []byte, start, end int) []byte {
	dst = appendKey(dst, "start")
	dst = strconv.AppendInt(dst, int64(start), 10)
	dst = append(dst, ',')
	dst = appendKey(dst, "end")
	return strconv.AppendInt(dst, int64(end), 10)
}

// appendTruth appends t as one JSON line; json.Unmarshal of the line gives back t.
func appendTruth(dst []byte, t *Truth) []byte {
	dst = append(dst, `{"record":"incident","id":`...)
	dst = appendJSONString(dst, t.ID)
	dst = append(dst, `,"month":`...)
	dst = strconv.AppendInt(dst, int64(t.Month), 10)
	dst = append(dst, `,"theme":`...)
	dst = appendJSONString(dst, t.Theme)
	dst = append(dst, `,"themes":[`...)
	for i, s := range t.Themes {
		if i > 0 {
			dst = append(dst, ',')
		}
		dst = append(dst, `{"theme":`...)
		dst = appendJSONString(dst, s.Theme)
		dst = append(dst, `,"sentences":`...)
		dst = strconv.AppendInt(dst, int64(s.Sentences), 10)
		dst = append(dst, '}')
	}
	dst = append(dst, ']')
	if t.Template != "" {
		dst = append(dst, `,"template":`...)
		dst = appendJSONString(dst, t.Template)
	}
	dst = append(dst, `,"call_type_matches":`...)
	dst = strconv.AppendBool(dst, t.CallTypeMatches)
	dst = append(dst, `,"no_pii":`...)
	dst = strconv.AppendBool(dst, t.NoPII)
	dst = append(dst, `,"pii":[`...)
	for i, s := range t.PII {
		if i > 0 {
			dst = append(dst, ',')
		}
		dst = append(dst, `{"type":`...)
		dst = appendJSONString(dst, s.Type)
		dst = append(dst, ',')
		dst = appendSE(dst, s.Start, s.End)
		dst = append(dst, `,"text":`...)
		dst = appendJSONString(dst, s.Text)
		dst = append(dst, `,"cue":`...)
		dst = appendJSONString(dst, s.Cue)
		dst = append(dst, '}')
	}
	dst = append(dst, `],"noise":[`...)
	for i, s := range t.Noise {
		if i > 0 {
			dst = append(dst, ',')
		}
		dst = append(dst, `{"kind":`...)
		dst = appendJSONString(dst, s.Kind)
		dst = append(dst, ',')
		dst = appendSE(dst, s.Start, s.End)
		dst = append(dst, `,"noisy":`...)
		dst = appendJSONString(dst, s.Noisy)
		dst = append(dst, `,"original":`...)
		dst = appendJSONString(dst, s.Original)
		dst = append(dst, '}')
	}
	dst = append(dst, `],"html":[`...)
	for i, s := range t.HTML {
		if i > 0 {
			dst = append(dst, ',')
		}
		dst = append(dst, '{')
		dst = appendSE(dst, s.Start, s.End)
		dst = append(dst, `,"residue":`...)
		dst = appendJSONString(dst, s.Residue)
		dst = append(dst, `,"decoded":`...)
		dst = appendJSONString(dst, s.Decoded)
		dst = append(dst, `,"original":`...)
		dst = appendJSONString(dst, s.Original)
		dst = append(dst, '}')
	}
	dst = append(dst, `],"abbrevs":[`...)
	for i, s := range t.Abbrevs {
		if i > 0 {
			dst = append(dst, ',')
		}
		dst = append(dst, '{')
		dst = appendSE(dst, s.Start, s.End)
		dst = append(dst, `,"text":`...)
		dst = appendJSONString(dst, s.Text)
		dst = append(dst, `,"expansion":`...)
		dst = appendJSONString(dst, s.Expansion)
		dst = append(dst, '}')
	}
	return append(dst, "]}\n"...)
}
