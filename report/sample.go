package report

import (
	"fmt"
	"math"
	"math/rand/v2"
	"slices"
	"strings"
)

// SampleSettings sizes the invented data made by Sample.
type SampleSettings struct {
	// Narratives is the number of kept narratives; zero means 20000.
	Narratives int
	// Themes is the number of themes, at most 30; zero means 12.
	Themes int
	// Months is the number of calendar months, starting January 2023; zero means 24.
	Months int
	// Examples per theme, at most 5; zero means 4.
	Examples int
	// Hostile puts script and markup payloads into one theme label and one narrative,
	// for tests that check nothing in the data runs in the page.
	Hostile bool
	// Seed seeds the generator (with Seed+1 as the PCG stream); the same settings give
	// the same Data.
	Seed uint64
}

// The payloads Sample puts into the data when Hostile is set.
const (
	HostileScript = `<script>window.__pwned=1</script>`
	HostileImg    = `<img src=x onerror="window.__pwned=2">`
)

// sampleTheme is an invented theme: a label and the words its narratives use.
type sampleTheme struct {
	label string
	words []string
}

// sampleThemes are invented for the demo; the town (Larkmoor), its streets and every
// person are made up.
var sampleThemes = []sampleTheme{
	{"Parking and blocked driveways", []string{"parked", "driveway", "vehicle", "blocking", "tow", "ticket"}},
	{"Loud music and parties", []string{"music", "loud", "party", "neighbours", "noise", "speaker"}},
	{"Shoplifting at stores", []string{"store", "shoplifting", "merchandise", "security", "receipt", "exit"}},
	{"Welfare checks", []string{"welfare", "check", "elderly", "door", "relative", "answer"}},
	{"Traffic collisions", []string{"collision", "intersection", "driver", "damage", "injuries", "lane"}},
	{"Arguments at home", []string{"argument", "partner", "yelling", "apartment", "separated", "children"}},
	{"Alarms going off", []string{"alarm", "keyholder", "reset", "sensor", "building", "false"}},
	{"Lost and found property", []string{"wallet", "lost", "found", "phone", "returned", "owner"}},
	{"Damage to property", []string{"window", "broken", "damage", "vandalism", "fence", "spray"}},
	{"Trespass on closed sites", []string{"trespass", "site", "fenced", "construction", "warned", "leave"}},
	{"People acting suspiciously", []string{"suspicious", "male", "looking", "cars", "hoodie", "area"}},
	{"Mental health crises", []string{"crisis", "distressed", "clinician", "hospital", "calm", "voices"}},
	{"Force during arrest", []string{"handcuffed", "resisted", "ground", "arm", "taser", "injury"}},
	{"Animal complaints", []string{"dog", "barking", "loose", "animal", "bite", "leash"}},
	{"Fireworks", []string{"fireworks", "bang", "sky", "kids", "park", "smoke"}},
	{"Theft from cars", []string{"car", "smashed", "bag", "stolen", "glovebox", "overnight"}},
	{"Drug use in public", []string{"needle", "syringe", "using", "stairwell", "overdose", "naloxone"}},
	{"Complaints about officers", []string{"complainant", "rude", "officer", "badge", "attitude", "supervisor"}},
	{"Bicycle theft", []string{"bike", "lock", "rack", "cut", "frame", "bicycle"}},
	{"Road hazards", []string{"debris", "road", "pothole", "hazard", "cones", "highway"}},
	{"Fraud by phone", []string{"caller", "scam", "gift", "cards", "bank", "transfer"}},
	{"Missing persons", []string{"missing", "last", "seen", "description", "located", "family"}},
	{"School incidents", []string{"school", "student", "principal", "fight", "bus", "parents"}},
	{"Fights outside bars", []string{"bar", "bouncer", "fight", "intoxicated", "closing", "crowd"}},
	{"Abandoned vehicles", []string{"abandoned", "plates", "weeks", "expired", "registration", "street"}},
	{"Littering and dumping", []string{"dumped", "mattress", "rubbish", "alley", "bags", "furniture"}},
	{"Disputes with landlords", []string{"landlord", "tenant", "eviction", "locks", "rent", "belongings"}},
	{"Speeding complaints", []string{"speeding", "racing", "residential", "engine", "night", "radar"}},
	{"Found drugs and weapons", []string{"knife", "found", "bag", "evidence", "seized", "bushes"}},
	{"Hate graffiti", []string{"graffiti", "slur", "wall", "painted", "photographed", "removed"}},
}

var (
	sampleStreets = []string{"Alder Row", "Quarry Lane", "Brindle Street", "Marram Avenue", "Tollgate Road", "Heron Close", "Saltmarsh Way"}
	sampleGroups  = []string{"Northgate", "Harbour", "Old Town", "Eastfield"}
	sampleFiller  = []string{"reporting party", "stated that", "on arrival", "units", "advised", "and", "the", "near", "at about", "was", "no further action", "spoke with"}
)

// Sample returns invented but realistic-looking report data, for tests, benchmarks and
// demos. Nothing in it describes real people or places.
func Sample(s SampleSettings) *Data {
	if s.Narratives == 0 {
		s.Narratives = 20000
	}
	if s.Themes == 0 {
		s.Themes = 12
	}
	if s.Months == 0 {
		s.Months = 24
	}
	if s.Examples == 0 {
		s.Examples = 4
	}
	if s.Themes > len(sampleThemes) || s.Themes < 2 || s.Examples > 5 || s.Months < 2 {
		panic("report: SampleSettings out of range")
	}
	rng := rand.New(rand.NewPCG(s.Seed, s.Seed+1))

	months := make([]string, s.Months)
	for i := range months {
		months[i] = fmt.Sprintf("%04d-%02d", 2023+i/12, 1+i%12)
	}
	// One month with no data at all, to show a gap.
	gap := -1
	if s.Months >= 12 {
		gap = s.Months / 2
	}
	perMonth := float64(s.Narratives) / float64(s.Months)

	// Theme weights: a few large themes, a long tail.
	weights := make([]float64, s.Themes)
	var wsum float64
	for k := range weights {
		weights[k] = 1 / math.Pow(float64(k+1), 0.8) * (0.8 + 0.4*rng.Float64())
		wsum += weights[k]
	}

	d := &Data{
		Title:    "Themes in Larkmoor incident narratives",
		Subtitle: "Invented sample data — the town, streets and people do not exist",
		Overview: Overview{
			Kept:  s.Narratives,
			First: months[0] + "-14",
			Last:  months[len(months)-1] + "-28",
			Rejected: []Reason{
				{"narrative empty", s.Narratives / 90},
				{"exact duplicate of an earlier row", s.Narratives / 140},
				{"date missing or unreadable", s.Narratives / 400},
			},
			Routine:     s.Narratives / 12,
			RoutineNote: "Narratives that only repeat a stock phrase (e.g. \"alarm reset, no further action\") were set aside before fitting.",
		},
	}
	d.Overview.Read = d.Overview.Kept + d.Overview.Routine
	for _, r := range d.Overview.Rejected {
		d.Overview.Read += r.Count
	}

	for k := 0; k < s.Themes; k++ {
		st := sampleThemes[k]
		share := weights[k] / wsum
		th := Theme{
			ID:               k,
			Label:            strings.Join(st.words[:3], ", "),
			TopWords:         slices.Clone(st.words),
			RelevantWords:    []string{st.words[1], st.words[0], st.words[3], st.words[2]},
			DistinctiveWords: []string{st.words[2], st.words[4], st.words[5]},
			GroupColumn:      "District",
		}
		if k%3 == 0 {
			th.Label = st.label
			th.LabelByPerson = true
			th.Description = "Narratives mostly about " + strings.ToLower(st.label) + "."
		}
		if k == 1 && s.Hostile {
			th.Label = HostileImg + " Noise " + HostileScript
			th.LabelByPerson = true
		}
		expected := share * float64(s.Narratives)
		th.Size = Size{Expected: math.Round(expected*10) / 10, Share: share, Dominant: countText(int(expected * 0.8))}

		// Monthly series: a slow drift with noise, and a bump in one theme.
		level := share * 0.8
		drift := (rng.Float64() - 0.5) * level / float64(s.Months)
		for m := range months {
			p := MonthPoint{Month: months[m]}
			if m == gap {
				p.Gap = true
				th.Months = append(th.Months, p)
				continue
			}
			n := int(perMonth * (0.85 + 0.3*rng.Float64()))
			if m == 0 || m == s.Months-1 {
				p.Partial = true
				n /= 2
			}
			mu := level + drift*float64(m)
			if k == 2 && m == s.Months*3/4 {
				mu *= 2.2
			}
			c := int(math.Round(float64(n) * math.Max(0.002, mu*(0.85+0.3*rng.Float64()))))
			p.Count = countText(c)
			if c < 10 {
				p.Withheld = true
			} else {
				p.Share = float64(c) / float64(n)
				p.Low, p.High = wilson(c, n, 1.959963984540054)
			}
			if k == 2 && m == s.Months*3/4 && !p.Withheld {
				p.Flag = "high"
				p.FlagText = "More than the previous months would lead one to expect (EARS C2 above 3). Worth a closer look; not a finding."
			}
			th.Months = append(th.Months, p)
		}
		th.TrendNote = "No clear rise or fall over the whole period (Mann–Kendall test, p = 0.41)."
		if drift > 0.3*level/float64(s.Months) {
			th.TrendNote = "Rising slowly over the whole period (Poisson regression on month with the month's total as offset, p = 0.02)."
		}

		for g, name := range sampleGroups {
			n := s.Narratives / len(sampleGroups)
			c := int(float64(n) * share * (0.6 + 0.8*rng.Float64()))
			gs := GroupShare{Group: name, Count: countText(c)}
			if c < 10 {
				gs.Withheld = true
			} else {
				gs.Share = float64(c) / float64(n)
				gs.Low, gs.High = wilson(c, n, 1.959963984540054)
			}
			if g == k%len(sampleGroups) && !gs.Withheld && k%4 == 0 {
				gs.StandsOut, gs.Higher = "more than in the other districts", true
			}
			th.Groups = append(th.Groups, gs)
		}

		for e := 0; e < s.Examples; e++ {
			m := rng.IntN(s.Months)
			if m == gap {
				m = (m + 1) % s.Months
			}
			ex := Example{
				ID:       fmt.Sprintf("LK-%s-%05d", months[m][:4], rng.IntN(100000)),
				Date:     fmt.Sprintf("%s-%02d", months[m], 1+rng.IntN(28)),
				Share:    math.Round((0.45+0.5*rng.Float64())*100) / 100,
				Segments: sampleNarrative(rng, st.words),
			}
			if k == 0 && e == 0 && s.Hostile {
				ex.Segments = append(ex.Segments,
					Segment{Text: " Caller wrote " + HostileScript + " in the form and also "},
					Segment{Text: HostileImg, Hit: false},
					Segment{Text: " — both shown as text."})
			}
			th.Examples = append(th.Examples, ex)
		}
		d.Themes = append(d.Themes, th)
	}
	slices.SortStableFunc(d.Themes, func(a, b Theme) int {
		switch {
		case a.Size.Expected > b.Size.Expected:
			return -1
		case a.Size.Expected < b.Size.Expected:
			return 1
		}
		return 0
	})

	d.Tree = sampleTree(rng, d.Themes)
	d.Mixture = sampleMixture(rng, s.Themes, s.Hostile)
	d.Copies = sampleCopies(rng, d.Themes)
	d.KChoice = sampleKChoice(s.Themes)
	d.Methods = Methods{
		Steps: []string{
			"Read every row and account for it (kept, set aside as routine, or rejected with a reason).",
			"Clean the text: HTML residue, OCR errors, expanded abbreviations.",
			"Redact names, addresses, phone numbers, plates and dates of birth.",
			"Tokenise, remove stop words, stem (Snowball English), weigh by TF-IDF.",
			"Fit LDA themes; cluster the themes (Ward's method).",
			"Count themes month by month with 95% Wilson intervals; flag unusual months (EARS C2).",
			"Withhold counts below 10 and any that would reveal them.",
		},
		Settings: []KV{
			{"themes (K)", fmt.Sprint(s.Themes)},
			{"LDA alpha", "0.1"},
			{"LDA beta", "0.01"},
			{"Gibbs sweeps", "1000"},
			{"minimum document frequency", "5"},
			{"suppression threshold", "10"},
		},
		Seed: "20231101",
		Versions: []KV{
			{"undercurrent", "v0.1.0-dev"},
			{"Go", "go1.26.8"},
			{"gonum", "v0.17.0"},
			{"go-echarts", "v2.6.7"},
			{"echarts (browser)", "6.1.0"},
		},
		InputFingerprint: "sha256:3f0c9a7d1e2b4c6a8f0e1d2c3b4a5968778695a4b3c2d1e0f9e8d7c6b5a49382",
	}
	d.Cautions = []string{"This sample was generated by the program and describes no real place."}
	d.DataQuality = DataQuality{
		Notes: []string{
			fmt.Sprintf("Month %s has no narratives at all; it is shown as a gap, not as zero.", months[max(gap, 0)]),
			"The first and last months are only partly covered.",
		},
		Tables: []Table{{
			Title:   "Fields most often empty",
			Columns: []string{"field", "empty rows", "share"},
			Rows:    [][]string{{"district", "212", "4.8%"}, {"call type", "97", "2.2%"}, {"narrative", fmt.Sprint(d.Overview.Rejected[0].Count), "1.1%"}},
		}},
	}
	d.Redaction = RedactionCountsFrom(map[string]int{"person name": 4210, "phone number": 388, "street address": 1904, "vehicle plate": 512, "date of birth": 77})
	return d
}

// countText publishes a count, withholding counts below 10.
func countText(c int) string {
	if c < 10 {
		return "<10"
	}
	return fmt.Sprint(c)
}

// wilson is the 95% Wilson score interval (Wilson 1927) used for the sample only; the
// real series come from report/trend.
func wilson(c, n int, z float64) (lo, hi float64) {
	p := float64(c) / float64(n)
	nn := float64(n)
	den := 1 + z*z/nn
	mid := (p + z*z/(2*nn)) / den
	half := z / den * math.Sqrt(p*(1-p)/nn+z*z/(4*nn*nn))
	return math.Max(0, mid-half), math.Min(1, mid+half)
}

// sampleSentences are invented narrative sentences; each %s takes one of the theme's
// words, which become highlighted segments.
var sampleSentences = []string{
	"Reporting party stated there was a problem with %s and %s again this week.",
	"On arrival units spoke with [NAME], who said the %s started after the %s.",
	"[NAME] advised that %s had been an issue before and asked about %s.",
	"Officers checked the area for %s; nothing further about %s was found.",
	"Caller described %s near the corner and wanted someone to look at the %s.",
	"Per [NAME] the %s was reported to the manager, who mentioned %s.",
	"Advised both parties; %s noted in the log together with %s.",
}

func sampleNarrative(rng *rand.Rand, words []string) []Segment {
	var segs []Segment
	add := func(text string, hit bool) {
		if text == "" {
			return
		}
		if !hit && len(segs) > 0 && !segs[len(segs)-1].Hit {
			segs[len(segs)-1].Text += text
			return
		}
		segs = append(segs, Segment{Text: text, Hit: hit})
	}
	add(fmt.Sprintf("At about %02d%02d hrs units attended %d %s. ", rng.IntN(24), rng.IntN(60), 1+rng.IntN(200), sampleStreets[rng.IntN(len(sampleStreets))]), false)
	n := 2 + rng.IntN(3)
	for i := 0; i < n; i++ {
		parts := strings.Split(sampleSentences[rng.IntN(len(sampleSentences))], "%s")
		for j, part := range parts {
			add(part, false)
			if j < len(parts)-1 {
				add(words[rng.IntN(len(words))], true)
			}
		}
		add(" ", false)
	}
	add("Call back on 555-0142 if needed.", false)
	return segs
}

// sampleTree is single linkage on random positions on a line: merges come in order of
// increasing gap, so heights never decrease.
func sampleTree(rng *rand.Rand, themes []Theme) Tree {
	n := len(themes)
	t := Tree{Method: "Ward's method on Hellinger distances between the themes' word distributions (sample: invented distances)."}
	order := make([]int, n)
	pos := make([]float64, n)
	for i := range themes {
		// Leaves in model order.
		t.Leaves = append(t.Leaves, TreeLeaf{})
		order[i] = i
		pos[i] = rng.Float64()
	}
	byID := make(map[int]Theme, n)
	for _, th := range themes {
		byID[th.ID] = th
	}
	for i := range t.Leaves {
		t.Leaves[i] = TreeLeaf{Theme: i, Label: byID[i].Label}
	}
	slices.SortFunc(order, func(a, b int) int {
		if pos[a] < pos[b] {
			return -1
		}
		if pos[a] > pos[b] {
			return 1
		}
		return a - b
	})
	type gapT struct {
		at int
		h  float64
	}
	gaps := make([]gapT, n-1)
	for i := range gaps {
		gaps[i] = gapT{i, pos[order[i+1]] - pos[order[i]]}
	}
	slices.SortStableFunc(gaps, func(a, b gapT) int {
		if a.h < b.h {
			return -1
		}
		if a.h > b.h {
			return 1
		}
		return 0
	})
	// cluster[i] is the current cluster index holding sorted position i.
	cluster := make([]int, n)
	for i := range cluster {
		cluster[i] = order[i]
	}
	for j, g := range gaps {
		l, r := cluster[g.at], cluster[g.at+1]
		t.Merges = append(t.Merges, TreeMerge{Left: l, Right: r, Height: math.Round(g.h*1000) / 1000})
		id := n + j
		// Relabel both runs of positions.
		for i := range cluster {
			if cluster[i] == l || cluster[i] == r {
				cluster[i] = id
			}
		}
		if l < n && r < n && len(t.Suggestions) < 2 {
			t.Suggestions = append(t.Suggestions, MergeSuggestion{A: l, B: r, Height: math.Round(g.h*1000) / 1000, Why: "they are the closest pair in the tree and share many top words"})
		}
	}
	return t
}

func sampleKChoice(best int) KChoice {
	kc := KChoice{Note: fmt.Sprintf("%d themes balanced held-out fit, coherence and stability; more themes split existing ones without adding new subjects.", best)}
	for k := 5; k <= 40; k += 5 {
		x := float64(k - best)
		kc.Rows = append(kc.Rows, KRow{
			K:           k,
			HeldOutLL:   -7.9 + 0.5*(1-math.Exp(-float64(k)/10)),
			NPMI:        math.Round((0.12-0.00015*x*x)*1000) / 1000,
			UMass:       math.Round((-1.2-0.03*float64(k))*1000) / 1000,
			Stability:   math.Round((0.86-0.0004*(x+5)*(x+5))*1000) / 1000,
			Recommended: k == best,
		})
	}
	if best%5 != 0 || best > 40 {
		kc.Rows = append(kc.Rows, KRow{K: best, HeldOutLL: -7.5, NPMI: 0.12, UMass: -1.9, Stability: 0.86, Recommended: true})
		slices.SortFunc(kc.Rows, func(a, b KRow) int { return a.K - b.K })
	}
	return kc
}

// sampleMixture makes 40 invented columns of theme shares: each column leans on one theme
// (a few on two), in order of that theme.
func sampleMixture(rng *rand.Rand, k int, hostile bool) Mixture {
	m := Mixture{Method: "Sample: invented groups of narratives, ordered by their main theme."}
	for t := 0; t < k; t++ {
		m.Themes = append(m.Themes, t)
	}
	const cols = 40
	for c := 0; c < cols; c++ {
		main := c * k / cols
		sh := make([]float64, k)
		var sum float64
		for t := range sh {
			sh[t] = 0.05 * rng.Float64()
			if t == main {
				sh[t] += 1 + rng.Float64()
			}
			if c%7 == 3 && t == (main+1)%k {
				sh[t] += 0.8
			}
			sum += sh[t]
		}
		for t := range sh {
			sh[t] = math.Round(sh[t]/sum*1e4) / 1e4
		}
		col := MixColumn{Label: fmt.Sprintf("group %d", c+1), Count: countText(20 + rng.IntN(400)), Shares: sh}
		if hostile && c == 5 {
			col.Label = "group " + HostileImg
		}
		m.Columns = append(m.Columns, col)
	}
	return m
}

// sampleCopies makes three invented groups of narratives that repeat one text, in the
// largest themes, and each theme's share of narratives in them.
func sampleCopies(rng *rand.Rand, themes []Theme) Copies {
	c := Copies{
		Ran:    true,
		Method: "Sample: invented groups.",
		Groups: 5, Checked: 6200, Short: 11800, InGroups: "64",
		Note: "2 smaller groups, of fewer than 10 narratives each, are counted but not listed.",
	}
	sizes := []int{24, 15, 11}
	for g, n := range sizes {
		th := themes[g%len(themes)]
		ex := Example{ID: fmt.Sprintf("export.csv:%d", 100+rng.IntN(9000)), Date: fmt.Sprintf("2023-%02d-%02d", 1+g, 1+rng.IntN(28)), Share: 1,
			Segments: []Segment{
				{Text: "Responded to "}, {Text: sampleStreets[g%len(sampleStreets)], Hit: true},
				{Text: " for a report of " + strings.ToLower(th.TopWords[0]) + ". On arrival I walked the area and spoke with the "},
				{Text: "owner", Hit: true},
				{Text: ", who said the same thing had happened before. No further action."},
			}}
		c.Listed = append(c.Listed, CopyGroup{
			Number: g + 1, Size: fmt.Sprint(n), LeastSimilarity: math.Round((0.72+0.2*rng.Float64())*1e4) / 1e4,
			Themes: []CopyTheme{{Theme: th.ID, Label: th.Label, Count: countText(n - 1)}, {Theme: themes[(g+1)%len(themes)].ID, Label: themes[(g+1)%len(themes)].Label, Count: "<10"}},
			First:  fmt.Sprintf("2023-%02d", 1+g), Last: fmt.Sprintf("2024-%02d", 3+g),
			Example: ex,
		})
	}
	// The smallest theme is mostly copies of one text (a group of 40 beyond the listed
	// ones), so that its section warns about it.
	c.Listed = append(c.Listed, CopyGroup{Number: 4, Size: "40", LeastSimilarity: 0.81,
		Themes: []CopyTheme{{Theme: themes[len(themes)-1].ID, Label: themes[len(themes)-1].Label, Count: "40"}}, First: "2023-06", Last: "2023-09",
		Example: Example{ID: "export.csv:77", Date: "2023-06-02", Share: 1, Segments: []Segment{{Text: "Checked the "}, {Text: "north", Hit: true}, {Text: " gate and found it open again."}}}})
	c.InGroups = "104"
	for i := range themes {
		n := 0
		if i < len(sizes) {
			n = sizes[i]
		}
		if i == len(themes)-1 {
			n = 40
		}
		themes[i].Copies = countText(n)
		if n < 10 {
			themes[i].CopiesWithheld = true
		} else {
			themes[i].CopiesShare = float64(n) / 1000
		}
		if i == len(themes)-1 {
			themes[i].CopiesShare = 0.37
		}
	}
	return c
}
