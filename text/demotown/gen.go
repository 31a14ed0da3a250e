package demotown

import (
	"math"
	"math/rand/v2"
	"sort"
	"strings"
	"time"
)

// pieceKind classifies the pieces a narrative is assembled from before rendering.
type pieceKind uint8

const (
	pkWord  pieceKind = iota // a run of letters, digits, apostrophes and hyphens
	pkOther                  // punctuation and other characters
	pkSpace                  // one space between words
	pkSent                   // the space between two sentences
	pkAbbr                   // an abbreviation (key of abbrevs)
	pkPII                    // a PII value
)

type piece struct {
	s     string
	kind  pieceKind
	elig  bool  // a content word that may receive OCR noise
	noise bool  // chosen for noise
	typo  bool  // chosen for a misspelling
	meta  int32 // index into generator.metas for pkPII
}

type piiMeta struct{ typ, cue string }

type person struct {
	first, last string
	female      bool
}

// piiSlots are the template slots that produce PII.
var piiSlots = map[string]bool{
	"NAME": true, "MR": true, "LAST": true, "FIRST": true, "PHONE": true, "EMAIL": true, "PLATE": true,
	"VIN": true, "DOB": true, "DOBV": true, "AGE": true, "ADDR": true, "BLOCK": true,
	"XST": true, "CASE": true, "SSN": true,
}

// pool is a list of templates split into those without PII slots (clean) and with (dirty).
type pool struct {
	all          []string
	clean, dirty []int
}

type theme struct {
	def               *themeDef
	open, body, close pool
}

// Tables built from the templates, by variable initialisation so that they exist before
// any other package-level variable (a test's corpus, say) needs them.
var (
	themes, shared = buildThemes()
	streetText     = buildStreetText() // "Marrowell St"
	hhmm           = buildHHMM()       // "0000".."2355"
	vocab          = buildVocab()      // every lower-cased word of the templates and lists
)

func hasPII(s string) bool {
	for i := 0; i < len(s); i++ {
		if s[i] == '{' {
			j := strings.IndexByte(s[i:], '}')
			if piiSlots[s[i+1:i+j]] {
				return true
			}
		}
	}
	return false
}

func newPool(ts []string) pool {
	if len(ts) > 64 {
		panic("demotown: more than 64 templates in a pool")
	}
	p := pool{all: ts}
	for i, t := range ts {
		if hasPII(t) {
			p.dirty = append(p.dirty, i)
		} else {
			p.clean = append(p.clean, i)
		}
	}
	return p
}

func buildThemes() ([]theme, pool) {
	var ts []theme
	for i := range themeDefs {
		d := &themeDefs[i]
		ts = append(ts, theme{def: d, open: newPool(d.open), body: newPool(d.body), close: newPool(d.close)})
	}
	return ts, newPool(sharedBody)
}

func buildStreetText() []string {
	var out []string
	for _, s := range streets {
		out = append(out, s.name+" "+s.suffix)
	}
	return out
}

func buildHHMM() []string {
	var out []string
	for h := 0; h < 24; h++ {
		for m := 0; m < 60; m += 5 {
			out = append(out, string([]byte{byte('0' + h/10), byte('0' + h%10), byte('0' + m/10), byte('0' + m%10)}))
		}
	}
	return out
}

func buildVocab() map[string]bool {
	v := map[string]bool{}
	addWords := func(s string) {
		for _, w := range strings.FieldsFunc(s, func(r rune) bool { return r > 127 || !isLetter(byte(r)) }) {
			v[strings.ToLower(w)] = true
		}
	}
	for _, d := range themeDefs {
		for _, l := range [][]string{d.open, d.body, d.close} {
			for _, s := range l {
				addWords(s)
			}
		}
	}
	for _, s := range sharedBody {
		addWords(s)
	}
	for _, alts := range syn {
		for _, s := range alts {
			addWords(s)
		}
	}
	for _, l := range [][]string{places, MaleFirstNames, FemaleFirstNames, Surnames} {
		for _, s := range l {
			addWords(s)
		}
	}
	for _, s := range streets {
		addWords(s.name + " " + s.suffix)
	}
	return v
}

func isLetter(c byte) bool { return c >= 'a' && c <= 'z' || c >= 'A' && c <= 'Z' }

func isWordByte(c byte) bool {
	return isLetter(c) || c >= '0' && c <= '9' || c == '\'' || c == '-'
}

// eligible reports whether a template word may receive noise: four or more lower-case
// letters and not a stop word.
func eligible(s string) bool {
	if len(s) < 4 {
		return false
	}
	for i := 0; i < len(s); i++ {
		if s[i] < 'a' || s[i] > 'z' {
			return false
		}
	}
	return !stop[s]
}

// periodAbbr are abbreviations written with a trailing period.
var periodAbbr = []string{"sgt", "ofc", "apt", "approx", "dept"}

// generator holds the state of one corpus being generated, one narrative at a time.
type generator struct {
	cfg     Config
	r       *rand.Rand // content
	nr      *rand.Rand // OCR noise
	hr      *rand.Rand // HTML residue
	tp      *rand.Rand // template copies
	monthly [][]float64
	cum     [][]float64
	counts  []int // narratives per month

	noiseDebt int
	typoDebt  int

	month, inMonth, monthN int
	curYear, yearCount     int

	pieces   []piece
	metas    []piiMeta
	sent     int // index of the first piece of the current sentence
	capNext  bool
	female   bool
	layout   int
	animal   string
	date     []byte  // the incident's date, for {date}
	ihhmm    [4]byte // the incident's time, for {ihhmm}
	ref      string  // the theme's noun phrase, for {ref}
	pii      bool    // whether {LOC} is PII
	people   []person
	buf      []byte
	out      []byte
	capCache map[string]string
	cand     []int
}

func newGenerator(cfg Config) *generator {
	cfg = cfg.resolved()
	g := &generator{
		cfg:      cfg,
		r:        rand.New(rand.NewPCG(cfg.Seed, 0x64656d6f746f776e)),
		nr:       rand.New(rand.NewPCG(cfg.Seed, 0x6e6f697365)),
		hr:       rand.New(rand.NewPCG(cfg.Seed, 0x68746d6c)),
		tp:       rand.New(rand.NewPCG(cfg.Seed, 0x74656d706c)),
		monthly:  monthlyProbs(cfg),
		counts:   monthCounts(cfg),
		capCache: map[string]string{},
	}
	for _, p := range g.monthly {
		c := make([]float64, len(p))
		s := 0.0
		for i, v := range p {
			s += v
			c[i] = s
		}
		g.cum = append(g.cum, c)
	}
	g.month = -1
	g.advanceMonth()
	return g
}

// seasonal holds 1 + 0.5 cos(2 pi (k - 6) / 12) for calendar months k = 0 (January) .. 11,
// peaking in July, written out so that no platform's cosine changes a bit.
var seasonal = [12]float64{
	1 - 0.5, 1 - 0.5*0.8660254037844386, 1 - 0.5*0.5, 1, 1 + 0.5*0.5, 1 + 0.5*0.8660254037844386,
	1 + 0.5, 1 + 0.5*0.8660254037844386, 1 + 0.5*0.5, 1, 1 - 0.5*0.5, 1 - 0.5*0.8660254037844386,
}

// monthlyProbs returns, for each month index m, each theme's probability (its share):
//
//	p_t(m) = base_t * f_t(m)
//
// with f = 1 (Flat), 0.6 + m/(Months-1) (Rising), 0 before AppearMonth and 1 from it
// (Appearing) and the seasonal table above by calendar month (Seasonal); the Residual
// (routine) theme takes the rest, 1 - sum of the others. Flat themes therefore keep
// exactly the same share every month. With the bases of themes.go the residual stays
// between about 0.14 and 0.32.
func monthlyProbs(cfg Config) [][]float64 {
	out := make([][]float64, cfg.Months)
	appear := AppearMonth(cfg.Months)
	for m := range out {
		p := make([]float64, len(themeDefs))
		cal := (int(cfg.Start.Month()) - 1 + m) % 12
		sum := 0.0
		res := -1
		for i, d := range themeDefs {
			f := 1.0
			switch d.trend {
			case Rising:
				f = 0.6
				if cfg.Months > 1 {
					f = 0.6 + float64(m)/float64(cfg.Months-1)
				}
			case Appearing:
				if m < appear {
					f = 0
				}
			case Seasonal:
				f = seasonal[cal]
			case Residual:
				res = i
				continue
			}
			p[i] = float64(d.base * f)
			sum += p[i]
		}
		if res < 0 || sum > 0.95 {
			panic("demotown: theme shares leave no residual")
		}
		p[res] = 1 - sum
		out[m] = p
	}
	return out
}

// monthCounts splits N over the months in proportion to
//
//	v_m = (1 + 0.15 (s_m - 1) / 0.7) (0.9 + 0.2 u_m)
//
// where s_m is the seasonal table for month m's calendar month (so summer months are 15%
// busier and winter ones 15% quieter) and u_m is uniform on [0,1) from its own PCG stream;
// the largest-remainder method makes the counts sum to N exactly (ties to the earlier
// month).
func monthCounts(cfg Config) []int {
	r := rand.New(rand.NewPCG(cfg.Seed, 0x6d6f6e746873))
	v := make([]float64, cfg.Months)
	sum := 0.0
	for m := range v {
		cal := (int(cfg.Start.Month()) - 1 + m) % 12
		v[m] = float64(1+float64(0.15*(seasonal[cal]-1))/0.5) * float64(0.9+float64(0.2*r.Float64()))
		sum += v[m]
	}
	counts := make([]int, cfg.Months)
	frac := make([]float64, cfg.Months)
	left := cfg.N
	for m := range v {
		x := float64(cfg.N) * v[m] / sum
		counts[m] = int(x)
		frac[m] = x - float64(counts[m])
		left -= counts[m]
	}
	idx := make([]int, cfg.Months)
	for i := range idx {
		idx[i] = i
	}
	sort.SliceStable(idx, func(a, b int) bool { return frac[idx[a]] > frac[idx[b]] })
	for i := 0; i < left; i++ {
		counts[idx[i%len(idx)]]++
	}
	return counts
}

func (g *generator) advanceMonth() {
	g.month++
	g.inMonth = 0
	g.monthN = g.counts[g.month]
	for g.monthN == 0 && g.month < g.cfg.Months-1 {
		g.month++
		g.monthN = g.counts[g.month]
	}
}

// next generates the next incident and its truth.
func (g *generator) next() (Incident, Truth) {
	if g.inMonth >= g.monthN {
		g.advanceMonth()
	}
	m := g.month
	start := g.cfg.Start.AddDate(0, m, 0)
	end := g.cfg.Start.AddDate(0, m+1, 0)
	frac := (float64(g.inMonth) + g.r.Float64()) / float64(g.monthN)
	t := start.Add(time.Duration(frac * float64(end.Sub(start)))).Truncate(time.Minute)
	g.inMonth++
	if t.Year() != g.curYear {
		g.curYear, g.yearCount = t.Year(), 0
	}
	g.yearCount++

	var inc Incident
	var tr Truth
	id := make([]byte, 0, 12)
	id = append(id, 'Q', 'M')
	id = append2(id, t.Year()%100)
	id = append(id, '-')
	id = append6(id, g.yearCount)
	inc.ID = string(id)
	inc.Reported = t
	tr.ID = inc.ID
	tr.Month = m

	ti := g.pickTheme(m, -1)
	th := &themes[ti]
	tr.Theme = th.def.name
	g.narrative(ti, t, &tr)
	if f := familyOf[ti]; f != nil && g.cfg.TemplateRate > 0 && g.tp.Float64() < g.cfg.TemplateRate {
		g.templated(f, &tr)
	}
	inc.Narrative = g.render(&tr)
	tr.NoPII = len(tr.PII) == 0

	// Call type agrees with the theme 65% of the time; otherwise any call type of the
	// other themes.
	if g.r.Float64() < 0.65 {
		inc.CallType = th.def.callTypes[g.r.IntN(len(th.def.callTypes))]
		tr.CallTypeMatches = true
	} else {
		o := g.r.IntN(len(themes) - 1)
		if o >= ti {
			o++
		}
		ct := themes[o].def.callTypes
		inc.CallType = ct[g.r.IntN(len(ct))]
	}
	// District: the theme's favoured district half the time, otherwise uniform (so the
	// favoured district holds 60% of a theme's narratives).
	d := th.def.district
	if g.r.IntN(2) == 0 {
		d = g.r.IntN(len(Districts))
	}
	inc.District = Districts[d]
	u := make([]byte, 0, 4)
	u = append(u, byte('1'+d), "ABC"[g.r.IntN(3)])
	u = append2(u, 10+g.r.IntN(40))
	inc.Unit = string(u)
	return inc, tr
}

// append6 appends n with at least six digits, zero-padded.
func append6(dst []byte, n int) []byte {
	for p := 100000; p > 1 && n < p; p /= 10 {
		dst = append(dst, '0')
	}
	return appendInt(dst, n)
}

// pickTheme draws a theme index for month m, never not (when not >= 0) nor, with not >= 0,
// the routine theme.
func (g *generator) pickTheme(m, not int) int {
	c := g.cum[m]
	for try := 0; ; try++ {
		u := g.r.Float64() * c[len(c)-1]
		i := 0
		for i < len(c)-1 && u >= c[i] {
			i++
		}
		if not < 0 || (i != not && themeDefs[i].name != ThemeRoutine && g.monthly[m][i] > 0) {
			return i
		}
		if try > 50 {
			return -1
		}
	}
}

// Sentence roles in a narrative's plan.
const (
	roleOpen = iota
	roleBody
	roleSecond
	roleShared
	roleClose
)

func (g *generator) narrative(ti int, t time.Time, tr *Truth) {
	g.pieces = g.pieces[:0]
	g.metas = g.metas[:0]
	g.people = g.people[:0]
	g.animal = ""
	g.female = g.r.IntN(2) == 0
	th := &themes[ti]
	d := th.def
	u := g.r.Float64()
	// Lengths skewed towards short: minLen + floor((maxLen-minLen+1) u^1.5).
	L := d.minLen + int(float64(d.maxLen-d.minLen+1)*float64(u*math.Sqrt(u)))
	routine := d.name == ThemeRoutine
	si := -1
	if !routine && g.cfg.MixRate > 0 && g.r.Float64() < g.cfg.MixRate {
		si = g.pickTheme(tr.Month, ti)
		if si >= 0 && L < 3 {
			L = 3
		}
	}
	L0 := 0 // preamble sentences
	var plan [16]int
	for i := 0; i < L; i++ {
		plan[i] = roleBody
		if !routine && g.r.IntN(5) == 0 {
			plan[i] = roleShared
		}
	}
	plan[0] = roleOpen
	if L >= 2 {
		plan[L-1] = roleClose
	}
	if si >= 0 {
		k := 1 + g.r.IntN(max(1, (L-2)/2))
		for k > 0 {
			p := 1 + g.r.IntN(L-2)
			if plan[p] != roleSecond {
				plan[p] = roleSecond
				k--
			}
		}
	}
	poolFor := func(role int) *pool {
		switch role {
		case roleOpen:
			return &th.open
		case roleBody:
			return &th.body
		case roleSecond:
			return &themes[si].body
		case roleShared:
			return &shared
		}
		return &th.close
	}
	force := -1
	if !routine && g.cfg.PIIRate > 0 && g.r.Float64() < g.cfg.PIIRate {
		force = g.r.IntN(L)
		if len(poolFor(plan[force]).dirty) == 0 {
			force = 0
		}
	}
	// Layout habits of the writer: most put one space between sentences, some two
	// (typewriter style), some break lines or paragraphs.
	switch k := g.r.IntN(20); {
	case k < 2:
		g.layout = layoutTwoSpaces
	case k < 4:
		g.layout = layoutLines
	default:
		g.layout = layoutOneSpace
	}
	// A dispatch-log preamble in front of a fifth of the non-routine narratives.
	if !routine && L < 12 && g.r.IntN(5) == 0 {
		g.date = t.AppendFormat(g.date[:0], "1/2/2006")
		copy(g.ihhmm[:], t.Format("1504"))
		g.ref = d.ref[g.r.IntN(len(d.ref))]
		g.pii = force >= 0
		g.capNext = true
		g.sent = 0
		g.expand(preambles[g.r.IntN(len(preambles))], 0)
		g.add(g.sep(), pkSent)
		L0++
	}
	var used [5]uint64
	for i := 0; i < L; i++ {
		p := poolFor(plan[i])
		var cands []int
		switch {
		case force < 0:
			cands = p.clean
			if len(cands) == 0 {
				p, plan[i] = &shared, roleShared
				cands = p.clean
			}
		case i == force:
			cands = p.dirty
			if len(cands) == 0 {
				cands = shared.dirty
				p = &shared
				plan[i] = roleShared
			}
		default:
			cands = nil // any
		}
		var k int
		for try := 0; try < 8; try++ {
			if cands == nil {
				k = g.r.IntN(len(p.all))
			} else {
				k = cands[g.r.IntN(len(cands))]
			}
			if used[plan[i]]&(1<<k) == 0 {
				break
			}
		}
		used[plan[i]] |= 1 << k
		if i > 0 {
			g.add(g.sep(), pkSent)
		}
		g.capNext = true
		g.sent = len(g.pieces)
		g.expand(p.all[k], 0)
	}
	nSecond := 0 // counted after the loop, which may turn a role into roleShared
	for _, r := range plan[:L] {
		if r == roleSecond {
			nSecond++
		}
	}
	tr.Themes = append(tr.Themes[:0], ThemeShare{Theme: d.name, Sentences: L0 + L - nSecond})
	if nSecond > 0 {
		tr.Themes = append(tr.Themes, ThemeShare{Theme: themes[si].def.name, Sentences: nSecond})
	}
}

// Sentence separators by writer habit.
const (
	layoutOneSpace = iota
	layoutTwoSpaces
	layoutLines // "\n" or a blank line between some sentences
)

// sep returns the separator before the next sentence.
func (g *generator) sep() string {
	switch g.layout {
	case layoutTwoSpaces:
		return "  "
	case layoutLines:
		switch g.r.IntN(4) {
		case 0:
			return "\n"
		case 1:
			return "\n\n"
		}
	}
	return " "
}

func (g *generator) add(s string, kind pieceKind) {
	if s == "" {
		return
	}
	p := piece{s: s, kind: kind, meta: -1}
	if kind == pkWord {
		p.elig = eligible(s)
	}
	if g.capNext && kind != pkSpace && kind != pkSent {
		g.capNext = false
		if c := s[0]; c >= 'a' && c <= 'z' {
			cs, ok := g.capCache[s]
			if !ok {
				cs = string(c-'a'+'A') + s[1:]
				g.capCache[s] = cs
			}
			p.s = cs
		}
	}
	g.pieces = append(g.pieces, p)
}

func (g *generator) expand(s string, depth int) {
	if depth > 4 {
		panic("demotown: slots nested too deep in " + s)
	}
	for i := 0; i < len(s); {
		c := s[i]
		switch {
		case c == '{':
			j := strings.IndexByte(s[i:], '}')
			g.slot(s[i+1:i+j], depth)
			i += j + 1
		case c == '^':
			j := i + 1
			for j < len(s) && (isLetter(s[j]) || s[j] == '/') {
				j++
			}
			if j < len(s) && s[j] == '.' {
				for _, a := range periodAbbr {
					if strings.EqualFold(a, s[i+1:j]) {
						j++
						break
					}
				}
			}
			g.add(s[i+1:j], pkAbbr)
			i = j
		case c == ' ':
			g.add(" ", pkSpace)
			i++
		case isWordByte(c):
			j := i + 1
			for j < len(s) && isWordByte(s[j]) {
				j++
			}
			g.add(s[i:j], pkWord)
			i = j
		default:
			j := i + 1
			for j < len(s) && !isWordByte(s[j]) && s[j] != ' ' && s[j] != '{' && s[j] != '^' {
				j++
			}
			g.add(s[i:j], pkOther)
			i = j
		}
	}
}

// locSlots are the PII slots a {LOC} becomes.
var locSlots = []string{"ADDR", "ADDR", "BLOCK", "XST"}

func (g *generator) pron(male, female string) {
	if g.female {
		g.add(female, pkWord)
	} else {
		g.add(male, pkWord)
	}
}

func (g *generator) slot(name string, depth int) {
	switch name {
	case "he":
		g.pron("he", "she")
	case "his":
		g.pron("his", "her")
	case "him":
		g.pron("him", "her")
	case "himself":
		g.pron("himself", "herself")
	case "st":
		g.expand(streetText[g.r.IntN(len(streetText))], depth+1)
	case "pl":
		g.expand(places[g.r.IntN(len(places))], depth+1)
	case "male", "female":
		// A person noun that agrees with the narrative's pronouns.
		alts := syn["male"]
		if g.female {
			alts = syn["female"]
		}
		g.expand(alts[g.r.IntN(len(alts))], depth+1)
	case "date":
		g.add(string(g.date), pkOther)
	case "ihhmm":
		g.add(string(g.ihhmm[:]), pkWord)
	case "ref":
		g.expand(g.ref, depth+1)
	case "LOC":
		if !g.pii {
			if g.r.IntN(2) == 0 {
				g.expand("{st}", depth+1)
			} else {
				g.expand("{pl}", depth+1)
			}
			return
		}
		g.piiSlot(locSlots[g.r.IntN(len(locSlots))])
	case "animal":
		// One animal per narrative.
		if g.animal == "" {
			alts := syn["animal"]
			g.animal = alts[g.r.IntN(len(alts))]
		}
		g.expand(g.animal, depth+1)
	case "hhmm":
		g.add(hhmm[g.r.IntN(len(hhmm))], pkWord)
	default:
		if piiSlots[name] {
			g.piiSlot(name)
			return
		}
		alts, ok := syn[name]
		if !ok {
			panic("demotown: unknown slot {" + name + "}")
		}
		g.expand(alts[g.r.IntN(len(alts))], depth+1)
	}
}

// newPerson returns a person of the narrative's gender (85%) or the other one.
func (g *generator) newPerson() person {
	f := g.female
	if g.r.IntN(20) < 3 {
		f = !f
	}
	return g.newPersonOf(f)
}

func (g *generator) newPersonOf(f bool) person {
	p := person{last: Surnames[g.r.IntN(len(Surnames))], female: f}
	if f {
		p.first = FemaleFirstNames[g.r.IntN(len(FemaleFirstNames))]
	} else {
		p.first = MaleFirstNames[g.r.IntN(len(MaleFirstNames))]
	}
	g.people = append(g.people, p)
	return p
}

// cue returns, lower-cased, the up to two tokens before the current end of the sentence,
// stopping at another PII value.
func (g *generator) cue() string {
	end := len(g.pieces)
	for end > g.sent && g.pieces[end-1].kind == pkSpace {
		end--
	}
	k, n := end, 0
	for k > g.sent && n < 2 {
		p := g.pieces[k-1]
		if p.kind == pkPII {
			break
		}
		k--
		if p.kind != pkSpace {
			n++
		}
	}
	if k == end {
		return ""
	}
	var b strings.Builder
	for _, p := range g.pieces[k:end] {
		b.WriteString(p.s)
	}
	return strings.ToLower(b.String())
}

func (g *generator) addPII(typ string, v []byte) {
	g.metas = append(g.metas, piiMeta{typ: typ, cue: g.cue()})
	g.pieces = append(g.pieces, piece{s: string(v), kind: pkPII, meta: int32(len(g.metas) - 1)})
	g.capNext = false
}

func (g *generator) piiSlot(name string) {
	r := g.r
	b := g.buf[:0]
	switch name {
	case "NAME":
		p := g.newPerson()
		switch r.IntN(10) {
		case 0:
			b = append(b, p.last...)
			b = append(b, ", "...)
			b = append(b, p.first...)
		case 1:
			b = append(b, p.first...)
			b = append(b, ' ', plateLetters[r.IntN(len(plateLetters))], '.', ' ')
			b = append(b, p.last...)
		default:
			b = append(b, p.first...)
			b = append(b, ' ')
			b = append(b, p.last...)
		}
		g.addPII(PIIName, b)
	case "LAST":
		g.addPII(PIIName, append(b, g.newPerson().last...))
	case "FIRST":
		g.addPII(PIIName, append(b, g.newPerson().first...))
	case "MR":
		var p person
		found := false
		for i := len(g.people) - 1; i >= 0; i-- {
			if g.people[i].female == g.female {
				p, found = g.people[i], true
				break
			}
		}
		if !found || r.IntN(10) < 3 {
			p = g.newPersonOf(g.female) // Mr./Ms. matches the narrative's pronouns
		}
		if p.female {
			g.add("Ms.", pkOther)
		} else {
			g.add("Mr.", pkOther)
		}
		g.add(" ", pkSpace)
		g.addPII(PIIName, append(b, p.last...))
	case "PHONE":
		g.addPII(PIIPhone, appendPhone(b, r))
	case "EMAIL":
		var p person
		if len(g.people) > 0 && r.IntN(2) == 0 {
			p = g.people[len(g.people)-1]
		} else {
			p = g.newPerson()
			g.people = g.people[:len(g.people)-1] // an address alone names nobody in the text
		}
		g.addPII(PIIEmail, appendEmail(b, r, p.first, p.last))
	case "PLATE":
		g.addPII(PIIPlate, appendPlate(b, r))
	case "VIN":
		g.addPII(PIIVIN, appendVIN(b, r))
	case "DOB":
		switch r.IntN(4) {
		case 0:
			g.expand("date of birth ", 1)
		case 1:
			g.expand("^dob ", 1)
		case 2:
			g.expand("^DOB: ", 1)
		default:
			g.expand("^DOB ", 1)
		}
		g.addPII(PIIDOB, appendDate(b, r))
	case "DOBV":
		g.addPII(PIIDOB, appendDate(b, r))
	case "AGE":
		n := 16 + r.IntN(70)
		switch r.IntN(4) {
		case 0:
			g.expand("age ", 1)
			g.addPII(PIIAge, appendInt(b, n))
		case 1:
			g.addPII(PIIAge, appendInt(b, n))
			g.expand(" years old", 1)
		default:
			g.addPII(PIIAge, appendInt(b, n))
			g.expand(" ^y/o", 1)
		}
	case "ADDR":
		s := streets[r.IntN(len(streets))]
		b = appendInt(b, 100+r.IntN(9800))
		b = append(b, ' ')
		b = append(b, s.name...)
		b = append(b, ' ')
		b = append(b, s.suffix...)
		if r.IntN(7) == 0 {
			b = append(b, " Apt "...)
			b = appendInt(b, 1+r.IntN(30))
			b = append(b, "ABCD"[r.IntN(4)])
		}
		g.addPII(PIIAddress, b)
	case "BLOCK":
		g.expand("the ", 1)
		b = appendInt(b, 100*(1+r.IntN(60)))
		b = append(b, " block of "...)
		b = append(b, streetText[r.IntN(len(streetText))]...)
		g.addPII(PIIAddressBlock, b)
	case "XST":
		i := r.IntN(len(streets))
		j := r.IntN(len(streets) - 1)
		if j >= i {
			j++
		}
		a, c := streets[i], streets[j]
		switch r.IntN(5) {
		case 0:
			b = append(b, a.name+" and "+c.name...)
		case 1:
			b = append(b, a.name+" "+a.suffix+"/"+c.name+" "+c.suffix...)
		case 2:
			b = append(b, a.name+" "+a.suffix+" & "+c.name+" "+c.suffix...)
		default:
			b = append(b, a.name+" "+a.suffix+" and "+c.name+" "+c.suffix...)
		}
		g.addPII(PIIIntersection, b)
	case "CASE":
		g.addPII(PIICase, appendCase(b, r, g.curYear-r.IntN(2)))
	case "SSN":
		g.addPII(PIISSN, appendSSN(b, r))
	}
	g.buf = b[:0]
}

func appendInt(dst []byte, n int) []byte {
	if n >= 10 {
		dst = appendInt(dst, n/10)
	}
	return append(dst, byte('0'+n%10))
}

// Noise kinds recorded in NoiseEvent.Kind.
const (
	NoiseConfusion = "confusion" // one OCR character confusion (o/0, l/1/i, s/5, m/rn, d/cl, e/c)
	NoiseSplit     = "split"     // a space inside the word
	NoiseHyphen    = "hyphen"    // an end-of-line hyphen break, "resi-\ndence"
	// Misspelling is not OCR noise but a writer's misspelling ("vehical"), planted in
	// TypoRate of the narratives.
	Misspelling = "misspelling"
)

// confusions are the OCR character confusions applied to content words, original form
// first.
var confusions = [][2]string{
	{"o", "0"}, {"l", "1"}, {"l", "i"}, {"i", "1"}, {"i", "l"}, {"s", "5"},
	{"m", "rn"}, {"rn", "m"}, {"d", "cl"}, {"cl", "d"}, {"e", "c"}, {"c", "e"},
}

// noisify returns an OCR-noisy form of w whose lower-case form is no word of the corpus's
// own vocabulary, or ok false.
func (g *generator) noisify(w string) (noisy, kind string, ok bool) {
	r := g.nr
	for try := 0; try < 4; try++ {
		k := r.IntN(10)
		switch {
		case k < 6:
			var at [24][2]int
			n := 0
			for i := 0; i < len(w) && n < len(at); i++ {
				for c, cf := range confusions {
					if strings.HasPrefix(w[i:], cf[0]) && n < len(at) {
						at[n] = [2]int{i, c}
						n++
					}
				}
			}
			if n == 0 {
				continue
			}
			a := at[r.IntN(n)]
			cf := confusions[a[1]]
			noisy, kind = w[:a[0]]+cf[1]+w[a[0]+len(cf[0]):], NoiseConfusion
		case k < 8:
			if len(w) < 5 {
				continue
			}
			p := 2 + r.IntN(len(w)-3)
			noisy, kind = w[:p]+" "+w[p:], NoiseSplit
		default:
			if len(w) < 6 {
				continue
			}
			p := 3 + r.IntN(len(w)-5)
			noisy, kind = w[:p]+"-\n"+w[p:], NoiseHyphen
		}
		if kind == NoiseConfusion && vocab[strings.ToLower(noisy)] {
			continue
		}
		return noisy, kind, true
	}
	return "", "", false
}

// render writes the pieces into the final narrative, planting OCR noise and HTML residue,
// and records every span in tr.
func (g *generator) render(tr *Truth) string {
	tr.PII, tr.Noise, tr.HTML, tr.Abbrevs = []Span{}, []NoiseEvent{}, []HTMLEvent{}, []Abbrev{}
	// A narrative drawn for noise that has no word to spoil passes its turn on to the
	// next one (noiseDebt), so that NoiseRate of the narratives carry noise.
	noisy := false
	if g.cfg.NoiseRate > 0 {
		noisy = g.nr.Float64() < g.cfg.NoiseRate
		if !noisy && g.noiseDebt > 0 {
			noisy = true
			g.noiseDebt--
		}
	}
	html := g.cfg.HTMLRate > 0 && g.hr.Float64() < g.cfg.HTMLRate
	if noisy {
		g.cand = g.cand[:0]
		chosen := false
		for i := range g.pieces {
			if g.pieces[i].elig {
				g.cand = append(g.cand, i)
				if g.nr.IntN(12) == 0 {
					g.pieces[i].noise = true
					chosen = true
				}
			}
		}
		if !chosen && len(g.cand) > 0 {
			g.pieces[g.cand[g.nr.IntN(len(g.cand))]].noise = true
		}
	}
	typos := false
	if g.cfg.TypoRate > 0 {
		typos = g.nr.Float64() < g.cfg.TypoRate
		if !typos && g.typoDebt > 0 {
			typos = true
			g.typoDebt--
		}
	}
	if typos {
		// Half of the misspellable words, at least one.
		g.cand = g.cand[:0]
		chosen := false
		for i := range g.pieces {
			p := &g.pieces[i]
			if p.kind == pkWord && !p.noise && misspellings[strings.ToLower(p.s)] != nil {
				g.cand = append(g.cand, i)
				if g.nr.IntN(2) == 0 {
					p.typo = true
					chosen = true
				}
			}
		}
		if !chosen && len(g.cand) > 0 {
			g.pieces[g.cand[g.nr.IntN(len(g.cand))]].typo = true
		}
		if len(g.cand) == 0 {
			g.typoDebt++ // passed on, as for noise
		}
	}
	out := g.out[:0]
	event := func(start int, residue, decoded, original string) {
		tr.HTML = append(tr.HTML, HTMLEvent{Start: start, End: len(out), Residue: residue, Decoded: decoded, Original: original})
	}
	wrap := html && g.hr.IntN(2) == 0
	if wrap {
		out = append(out, "<p>"...)
		event(0, "<p>", "", "")
	}
	for i := range g.pieces {
		p := &g.pieces[i]
		start := len(out)
		switch p.kind {
		case pkSpace:
			if html && g.hr.IntN(30) == 0 {
				out = append(out, "&nbsp;"...)
				event(start, "&nbsp;", "\u00a0", " ")
			} else {
				out = append(out, ' ')
			}
		case pkSent:
			if html && g.hr.IntN(3) == 0 {
				out = append(out, "<br />"...)
				event(start, "<br />", "\n", p.s)
			} else {
				out = append(out, p.s...)
			}
		case pkWord:
			switch {
			case p.noise:
				n, kind, ok := g.noisify(p.s)
				if !ok {
					out = append(out, p.s...)
					break
				}
				out = append(out, n...)
				tr.Noise = append(tr.Noise, NoiseEvent{Kind: kind, Start: start, End: len(out), Noisy: n, Original: p.s})
			case p.typo:
				alts := misspellings[strings.ToLower(p.s)]
				m := alts[g.nr.IntN(len(alts))]
				if p.s[0] < 'a' {
					m = string(p.s[0]) + m[1:]
				}
				out = append(out, m...)
				tr.Noise = append(tr.Noise, NoiseEvent{Kind: Misspelling, Start: start, End: len(out), Noisy: m, Original: p.s})
			case html && p.s == "and" && g.hr.IntN(2) == 0:
				out = append(out, "&amp;"...)
				event(start, "&amp;", "&", "and")
			case html && strings.IndexByte(p.s, '\'') >= 0:
				for j := 0; j < len(p.s); j++ {
					if p.s[j] == '\'' {
						// A word processor's curly apostrophe, raw or as an entity, or
						// the numeric entity of a straight one.
						s := len(out)
						switch k := g.hr.IntN(10); {
						case k < 6:
							out = append(out, "&#39;"...)
							event(s, "&#39;", "'", "'")
						case k < 9:
							out = append(out, "\u2019"...)
							event(s, "\u2019", "\u2019", "'")
						default:
							out = append(out, "&rsquo;"...)
							event(s, "&rsquo;", "\u2019", "'")
						}
					} else {
						out = append(out, p.s[j])
					}
				}
			default:
				out = append(out, p.s...)
			}
		case pkAbbr:
			out = append(out, p.s...)
			tr.Abbrevs = append(tr.Abbrevs, Abbrev{Start: start, End: len(out), Text: p.s, Expansion: abbrevs[strings.ToLower(strings.TrimSuffix(p.s, "."))]})
		case pkPII:
			out = append(out, p.s...)
			m := g.metas[p.meta]
			tr.PII = append(tr.PII, Span{Type: m.typ, Start: start, End: len(out), Text: p.s, Cue: m.cue})
		default:
			out = append(out, p.s...)
		}
	}
	if wrap {
		out = append(out, "</p>"...)
		event(len(out)-4, "</p>", "", "")
	} else if html && len(tr.HTML) == 0 {
		out = append(out, "<br />"...)
		event(len(out)-6, "<br />", "\n", "")
	}
	if noisy && len(tr.Noise) == 0 {
		g.noiseDebt++
	}
	g.out = out
	return string(out)
}
