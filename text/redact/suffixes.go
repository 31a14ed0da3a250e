package redact

import (
	"regexp"
	"sort"
	"strings"
)

// streetSuffixes maps street suffix names and their common variants to the standard
// abbreviation. Recalled from memory of USPS Publication 28, "Postal Addressing Standards",
// Appendix C1 (Street Suffix Abbreviations); a subset, not a copy of the whole table.
var streetSuffixes = map[string]string{
	"alley": "ALY", "aly": "ALY", "allee": "ALY",
	"avenue": "AVE", "ave": "AVE", "av": "AVE", "aven": "AVE", "avenu": "AVE", "avn": "AVE", "avnue": "AVE",
	"bayou": "BYU", "bend": "BND", "bnd": "BND", "bluff": "BLF", "blf": "BLF",
	"boulevard": "BLVD", "blvd": "BLVD", "boul": "BLVD", "boulv": "BLVD",
	"branch": "BR", "br": "BR", "bridge": "BRG", "brg": "BRG", "brook": "BRK", "brk": "BRK",
	"bypass": "BYP", "byp": "BYP", "causeway": "CSWY", "cswy": "CSWY",
	"center": "CTR", "ctr": "CTR", "centre": "CTR", "circle": "CIR", "cir": "CIR", "circ": "CIR",
	"cove": "CV", "cv": "CV", "court": "CT", "ct": "CT", "courts": "CTS", "cts": "CTS",
	"crescent": "CRES", "cres": "CRES", "crest": "CRST", "crossing": "XING", "xing": "XING",
	"creek": "CRK", "crk": "CRK", "dale": "DL", "drive": "DR", "dr": "DR", "drv": "DR", "drives": "DRS",
	"estates": "ESTS", "ests": "ESTS", "expressway": "EXPY", "expy": "EXPY", "exp": "EXPY",
	"extension": "EXT", "ext": "EXT", "freeway": "FWY", "fwy": "FWY",
	"gardens": "GDNS", "gdns": "GDNS", "garden": "GDN", "gateway": "GTWY", "gtwy": "GTWY",
	"glen": "GLN", "gln": "GLN", "green": "GRN", "grn": "GRN", "grove": "GRV", "grv": "GRV",
	"harbor": "HBR", "hbr": "HBR", "heights": "HTS", "hts": "HTS", "ht": "HTS",
	"highway": "HWY", "hwy": "HWY", "hiway": "HWY", "hill": "HL", "hl": "HL", "hills": "HLS",
	"hollow": "HOLW", "holw": "HOLW", "junction": "JCT", "jct": "JCT",
	"lane": "LN", "ln": "LN", "landing": "LNDG", "lndg": "LNDG", "loop": "LOOP",
	"manor": "MNR", "mnr": "MNR", "meadows": "MDWS", "mdws": "MDWS", "mall": "MALL", "mews": "MEWS",
	"motorway": "MTWY", "orchard": "ORCH", "orch": "ORCH", "oval": "OVAL", "overpass": "OPAS",
	"park": "PARK", "parkway": "PKWY", "pkwy": "PKWY", "pky": "PKWY", "pass": "PASS", "path": "PATH",
	"pike": "PIKE", "pines": "PNES", "place": "PL", "pl": "PL", "plaza": "PLZ", "plz": "PLZ",
	"point": "PT", "pt": "PT", "ridge": "RDG", "rdg": "RDG", "road": "RD", "rd": "RD", "roads": "RDS",
	"route": "RTE", "rte": "RTE", "row": "ROW", "run": "RUN", "square": "SQ", "sq": "SQ",
	"station": "STA", "sta": "STA", "street": "ST", "st": "ST", "str": "ST", "strt": "ST", "streets": "STS",
	"summit": "SMT", "terrace": "TER", "ter": "TER", "terr": "TER", "trace": "TRCE", "trce": "TRCE",
	"trail": "TRL", "trl": "TRL", "turnpike": "TPKE", "tpke": "TPKE", "tunnel": "TUNL",
	"underpass": "UPAS", "valley": "VLY", "vly": "VLY", "view": "VW", "vw": "VW",
	"village": "VLG", "vlg": "VLG", "vista": "VIS", "vis": "VIS", "walk": "WALK", "way": "WAY", "wy": "WAY",
}

// suffixPat is a regexp alternation of the suffixes, longest first.
func suffixPat() string { return suffixAlternation(true) }

// suffixAlternation is the suffixes as a case-insensitive regexp alternation, longest first
// or, for the ASCII variants of the patterns (see fastRe), in alphabetical order.
func suffixAlternation(longestFirst bool) string {
	ks := make([]string, 0, len(streetSuffixes))
	for k := range streetSuffixes {
		ks = append(ks, k)
	}
	sort.Slice(ks, func(i, j int) bool {
		if longestFirst && len(ks[i]) != len(ks[j]) {
			return len(ks[i]) > len(ks[j])
		}
		return ks[i] < ks[j]
	})
	return `(?i:` + strings.Join(ks, "|") + `)`
}

var (
	// street name words: capitalised words or ordinals ("4th").
	streetWord  = `(?:[0-9]{1,3}(?i:st|nd|rd|th)|[A-Z][A-Za-z'-]*)`
	directional = `(?:(?:[NSEW]|NE|NW|SE|SW|North|South|East|West|NORTH|SOUTH|EAST|WEST)\.?\s)`
	unitPat     = `(?:,?\s(?i:apt|apartment|unit|suite|ste|rm|room|lot|bldg|#)\.?\s?#?\s?[A-Za-z0-9-]{1,6}\b)`

	addressRe, blockRe, crossRe, cornerRe = compileStreetPatterns(suffixPat())
)

// streetPatWith is a street name: an optional directional, one to three name words and a
// suffix from the alternation sp.
func streetPatWith(sp string) string {
	return directional + `?(?:` + streetWord + `\s){1,3}` + sp + `\b\.?`
}

// compileStreetPatterns compiles the patterns that hold a suffix alternation, built on sp.
// Every use of sp is followed by \b.
func compileStreetPatterns(sp string) (address, block, cross, corner *regexp.Regexp) {
	street := streetPatWith(sp)
	// house number + street + suffix, optional trailing directional and unit.
	address = regexp.MustCompile(`\b[0-9]{1,6}[A-Za-z]?(?:-[0-9]{1,5})?\s` + street + `(?:\s(?:[NSEW]|NE|NW|SE|SW)\b)?` + unitPat + `?`)
	// "the 100 block of Main St": the block number and street.
	block = regexp.MustCompile(`\b[0-9]{1,6}\s(?i:block)\s(?i:of)\s` + directional + `?(?:` + streetWord + `\s?){1,3}(?:` + sp + `\b)?\.?`)
	// "Elm St and 4th Ave".
	cross = regexp.MustCompile(`(?:^|[^A-Za-z0-9])(` + street + `\s?(?:(?i:and|at)|&|/|@)\s?` + street + `)`)
	// "the corner of Elm and Oak", "intersection of Main St & 4th Ave".
	corner = regexp.MustCompile(`(?i:corner|intersection)\s(?i:of)\s(` + streetWord + `(?:\s` + streetWord + `){0,2}(?:\s` + sp + `\b\.?)?\s?(?:(?i:and)|&|/)\s?` + streetWord + `(?:\s` + streetWord + `){0,2}(?:\s` + sp + `\b\.?)?)`)
	return address, block, cross, corner
}

var (
	atAndPreps = set("at near to on from")
	atAndRe    = regexp.MustCompile(`\b(?i:at|near|to|on|from)\s((` + streetWord + `)\s?(?:(?i:and)|&)\s?(` + streetWord + `))\b(?:\s[A-Z])?`)
	ordinalRe  = regexp.MustCompile(`^[0-9]{1,3}(?i:st|nd|rd|th)$`)
	// "at Main/Oak", "near 4th/Elm" (only after "at" or "near": "on Air/Ground" and
	// "from Bendix/King" are not places).
	slashRe = regexp.MustCompile(`\b(?i:at|near)\s((?:[A-Z][A-Za-z]+|[0-9]{1,3}(?i:st|nd|rd|th))\s?/\s?(?:[A-Z][A-Za-z]+|[0-9]{1,3}(?i:st|nd|rd|th)))\b`)
)

var cornerTrig = set("corner intersection")

func (d *doc) addresses(cs []cand) []cand {
	trim := func(s, e int) int {
		for e > s && (d.text[e-1] == ' ' || d.text[e-1] == '\t') {
			e--
		}
		// a final "." belongs to the address only after an abbreviation ("St.").
		if e > s && d.text[e-1] == '.' {
			w := e - 1
			for w > s && isAlnumByte(d.text[w-1]) {
				w--
			}
			if ab := strings.ToLower(d.text[w : e-1]); len(ab) > 4 || streetSuffixes[ab] == "" {
				e--
			}
		}
		return e
	}
	// a house number is followed by a capitalised word, an ordinal or "block".
	nums := d.triggers(func(i int) bool {
		t := d.toks[i]
		if t.kind != tNum || t.end-t.start > 6 || i+1 >= len(d.toks) {
			return false
		}
		n := d.toks[i+1]
		if n.kind == tWord && n.start == t.end && n.end-n.start == 1 && i+2 < len(d.toks) {
			n = d.toks[i+2] // "123A Elm St"
		}
		if d.lower[i+1] == "block" {
			return true
		}
		if n.kind != tNum && (n.kind != tWord || d.text[n.start] < 'A' || d.text[n.start] > 'Z') {
			return false
		}
		// a suffix word must follow within six tokens.
		for k := i + 2; k < len(d.toks) && k <= i+7; k++ {
			if d.flags[k]&fSuffix != 0 {
				return true
			}
		}
		return false
	})
	add := func(m []int) { cs = append(cs, cand{typ: Address, start: m[0], end: trim(m[0], m[1])}) }
	d.scanAt(addressRe, nums, 128, add)
	d.scanAt(blockRe, nums, 96, add)
	sub := func(m []int) { cs = append(cs, cand{typ: Address, start: m[2], end: trim(m[2], m[3])}) }
	// an intersection has a suffix word followed by a joining word or sign.
	cross := d.triggers(func(i int) bool {
		if d.flags[i]&fSuffix == 0 {
			return false
		}
		j := i + 1
		if d.isPunct(j, ".") {
			j++
		}
		if j >= len(d.toks) {
			return false
		}
		w := strings.ToLower(d.word(j))
		return w == "and" || w == "&" || w == "at" || w == "/" || w == "@"
	})
	d.scan(crossRe, cross, 64, 80, sub)
	// "at Marrowell and Quennel": two bare street names after "at", "near", "to" ...; each must be an
	// ordinal or a word that is not an ordinary word or a given name.
	d.scan(atAndRe, d.triggers(func(i int) bool { return d.flags[i]&fAtAnd != 0 && d.pairAhead(i+1) }), 0, 64, func(m []int) {
		listsOnce.Do(loadLists)
		for _, g := range [][2]int{{m[4], m[5]}, {m[6], m[7]}} {
			w := d.text[g[0]:g[1]]
			if !ordinalRe.MatchString(w) && (isCommonWord(w) || stopNames[strings.ToLower(w)] || givenNames[strings.ToLower(w)] || surnames[strings.ToLower(w)]) {
				return
			}
		}
		if m[1] > m[3] {
			return // "at Elm and Oak Market": a longer capitalised name follows
		}
		sub(m)
	})
	d.scan(cornerRe, d.triggers(d.flagged(fCorner)), 0, 128, sub)
	d.scan(slashRe, d.triggers(func(i int) bool { return d.isPunct(i, "/") }), 40, 40, func(m []int) {
		// "AND/OR", "YES/NO" are not streets.
		listsOnce.Do(loadLists)
		for _, w := range strings.Split(strings.ToLower(d.text[m[2]:m[3]]), "/") {
			if w = strings.TrimSpace(w); stopNames[w] || w == "or" || w == "yes" || w == "no" {
				return
			}
		}
		sub(m)
	})
	return cs
}

// pairAhead reports whether token i starts "Name and" or "4th and" (or "&"): the start of
// a bare street pair.
func (d *doc) pairAhead(i int) bool {
	if i >= len(d.toks) {
		return false
	}
	j := i + 1
	switch t := d.toks[i]; {
	case t.kind == tWord && d.text[t.start] >= 'A' && d.text[t.start] <= 'Z':
	case t.kind == tNum && j < len(d.toks) && d.toks[j].kind == tWord && d.toks[j].start == t.end:
		j++ // "4th"
	default:
		return false
	}
	return j < len(d.toks) && (d.lower[j] == "and" || d.isPunct(j, "&"))
}
