package redact

import (
	_ "embed"

	"strings"
	"sync"
	"sync/atomic"
	"undercurrent/text/lexicon"
	"unicode"
	"unicode/utf8"
)

//go:embed names_en.txt
var namesEN string

var (
	listsOnce  sync.Once
	givenNames map[string]bool
	surnames   map[string]bool
	stopNames  map[string]bool // capitalised words that never start or continue a name
	orgWords   map[string]bool // words that make a capitalised run a business or place
	orgOnly    map[string]bool // orgWords without the street suffixes
	titleWords = set("mr mrs ms miss mx dr mister " + officerTitles)
	// officerTitles are ranks and titles of officers: their names are redacted like
	// anyone's (list them in Options.Allow to keep them), with a badge number after them.
	officerTitles = "officer ofc ofcr sgt sergeant det detective deputy dep cpl corporal lt lieutenant capt captain trooper tpr"
	officerTitle  = set(officerTitles)
	fullTitle     = set("officer sergeant detective deputy corporal lieutenant captain trooper mister miss")
	personVerbs   map[string]bool
	personBefore  = set("told asked saw called met per")
	strongVerbs   = set("said says stated states told tells reported advised explained admitted denied asked yelled fled")
	// words before a capitalised run that make it a thing, not a person: "a Timberjack
	// Feller Buncher", "caused by Myocardial Infarction" is kept out by "of"/"as" ...
	thingBefore      = set("a an the this that these those his her their its our your my each every any some of as using into onto")
	usStates         = set("AL AK AZ AR CA CO CT DE DC FL GA HI ID IL IN IA KS KY LA ME MD MA MI MN MS MO MT NE NV NH NJ NM NY NC ND OH OK OR PA RI SC SD TN TX UT VT VA WA WV WI WY PR")
	placePrepsBefore = set("in at near into inside via from of toward towards")
)

func set(words string) map[string]bool {
	m := map[string]bool{}
	for _, w := range strings.Fields(words) {
		m[w] = true
	}
	return m
}

func loadLists() {
	givenNames, surnames = map[string]bool{}, map[string]bool{}
	for _, line := range strings.Split(namesEN, "\n") {
		f := strings.Fields(line)
		if len(f) < 2 || f[0] == "#" {
			continue
		}
		m := givenNames
		if f[0] == "s" {
			m = surnames
		}
		for _, w := range f[1:] {
			m[w] = true
		}
	}
	stopNames = set(`the a an he she they them his her hers it its this that these those i we you
	me my our your their who whom whose what when where which while why how then than there here
	and or but nor so yet if at on in to from with by of for as into onto upon after before
	also not no yes had has have was were is are be been being did do does said stated advised
	unknown unk male female man woman boy girl officer officers ofc police dept department
	sheriff deputy sergeant sgt lieutenant lt detective det corporal cpl captain capt chief
	victim victims suspect suspects driver drivers caller witness witnesses complainant subject
	juvenile passenger owner resident employee employees worker workers rp party
	vehicle veh car truck van suv black white hispanic asian
	monday tuesday wednesday thursday friday saturday sunday january february march april may
	june july august september october november december
	name phone email ssn dob age plate vin address case no
	north south east west street avenue road drive lane court
	mr mrs ms miss mx dr mister sir madam st
	however therefore meanwhile additionally later subsequently finally thus instead also
	coworker coworkers co-worker supervisor foreman manager operator crew laborer`)
	orgWords = set(`inc llc co corp corporation company companies ltd limited lp llp pllc
	department dept county city town township village state university college school academy
	hospital clinic center centre church bank store stores market restaurant cafe bar grill pub
	motel hotel inn apartments apts plaza mall park lake river creek mountain mt fire police
	sheriff station district services service group associates industries industrial
	construction manufacturing farms farm ranch electric plumbing roofing builders contractors
	foods products systems international national federal united airport highway interstate
	route memorial medical health healthcare pharmacy market supermarket foundation society club
	association union committee council board court office agency bureau administration
	authority commission community elementary middle high institute library museum theater
	theatre stadium arena hall tower towers building bldg complex estates gardens heights
	terrace village woods hills valley bay beach island harbor port point ridge springs falls
	dispatch helibase helitack heliport airbase base forest forests butte peak mesa canyon
	ranger rangers rappellers rappel crew crews engine division div ops operations fire fires
	camp fort armory mountain mtn lookout repeater zone team hotshots smokejumpers wilderness
	monument refuge reservation field hardware diner storage laundromat pool launch transit
	motors auto garage salon barber bakery liquor mart depot shop shops supply tavern lounge
	cinema gym fitness laundry cleaners rental rentals lot yard towing wash elementary`)
	orgOnly = map[string]bool{}
	for k := range orgWords {
		orgOnly[k] = true
	}
	for k := range streetSuffixes {
		orgWords[k] = true
	}
	personVerbs = set(`said says stated states told tells reported reports advised advises
	explained admitted denied asked called yelled walked ran fled arrived left returned refused
	was is had has went came got took gave saw heard`)
}

// isDictWord reports whether w (any case) is an ordinary English word.
func isDictWord(w string) bool { return isDictLower(strings.ToLower(w)) }

// isDictLower is isDictWord of a word already in lower case (strings.ToLower).
func isDictLower(w string) bool {
	lw := baseLower(w)
	if lexicon.Has(lw) {
		return true
	}
	if strings.Contains(lw, "-") {
		for _, p := range strings.Split(lw, "-") {
			if !lexicon.Has(p) {
				return false
			}
		}
		return true
	}
	return false
}

// isCommonWord reports whether w is a dictionary word also seen in lower case in modern
// reports (not only in the literary vocabulary, which holds surnames such as "bromley").
func isCommonWord(w string) bool {
	return lexicon.Common(baseWord(w))
}

// isCommonLower is isCommonWord of a word already in lower case (strings.ToLower).
func isCommonLower(w string) bool {
	return lexicon.Common(baseLower(w))
}

// baseWord lower-cases w and removes a possessive or a contraction ("Quosby's" → "quosby",
// "I've" → "i"), so that contractions are found in the dictionary.
func baseWord(w string) string { return baseLower(strings.ToLower(w)) }

// baseLower is baseWord of a word already in lower case: lower-casing changes neither "'"
// nor "’", so the two agree.
func baseLower(w string) string {
	if !strings.ContainsAny(w, "'’") {
		return w
	}
	lw := strings.ReplaceAll(w, "’", "'")
	for _, suf := range []string{"'s", "'ve", "'d", "'re", "'ll", "'m", "n't"} {
		if strings.HasSuffix(lw, suf) && len(lw) > len(suf) {
			b := lw[:len(lw)-len(suf)]
			if suf == "'s" {
				return b
			}
			if lexicon.Has(b) || b == "i" || b == "ca" || b == "wo" {
				return "i" // a known word with a contraction is ordinary
			}
		}
	}
	return lw
}

func isNameListed(w string) bool {
	lw := strings.ToLower(w)
	return givenNames[lw] || surnames[lw]
}

// capitalised: an upper-case first letter followed by at least one lower-case letter.
func capitalised(w string) bool {
	r, n := utf8.DecodeRuneInString(w)
	if !unicode.IsUpper(r) {
		return false
	}
	if r2, _ := utf8.DecodeRuneInString(w[n:]); unicode.IsUpper(r2) {
		return false // "AAs", "IMTs": an abbreviation
	}
	for _, c := range w[n:] {
		if unicode.IsLower(c) {
			return true
		}
	}
	return false
}

func allUpper(w string) bool {
	has := false
	for _, c := range w {
		if unicode.IsLower(c) {
			return false
		}
		if unicode.IsUpper(c) {
			has = true
		}
	}
	return has
}

// isInitial reports whether token i is a single capital letter followed by ".".
func (d *doc) isInitial(i int) bool {
	if i >= len(d.toks) || d.toks[i].kind != tWord || d.toks[i].end-d.toks[i].start != 1 {
		return false
	}
	c := d.text[d.toks[i].start]
	return c >= 'A' && c <= 'Z' && d.isPunct(i+1, ".")
}

// nameToken reports whether token i can be part of a name after a cue.
func (d *doc) nameToken(i int) bool {
	if i >= len(d.toks) || d.toks[i].kind != tWord {
		return false
	}
	w := d.word(i)
	if len(w) < 2 || stopNames[strings.ToLower(w)] {
		return false
	}
	if capitalised(w) {
		return true
	}
	if allUpper(w) {
		// In capitals a dictionary word ("FLED") ends the name unless it is a known name;
		// so does a verb form the dictionary lacks ("MANEUVERED", "FRACTURING").
		if isNameListed(w) {
			return true
		}
		// In mixed-case text a word in capitals is usually an abbreviation ("DOZB"),
		// except in "QUOSBY, Ann".
		if !d.caps && !(d.isPunct(i+1, ",") && i+2 < len(d.toks) && d.toks[i+2].kind == tWord && capitalised(d.word(i+2))) {
			return false
		}
		lw := strings.ToLower(w)
		return !isDictWord(w) && !strings.HasSuffix(lw, "ed") && !strings.HasSuffix(lw, "ing") && !strings.HasSuffix(lw, "ly")
	}
	return false
}

// nameSeq reads a name starting at token i: up to three name words, with middle initials,
// or "LAST, FIRST". It returns the index after the last token used and the name words.
func (d *doc) nameSeq(i int) (end int, parts []string) {
	j := i
	// "juvenile J.D.": initials alone, two or more.
	if k := d.initialsAt(j); k >= j+4 {
		var b strings.Builder
		for m := j; m < k; m += 2 {
			b.WriteString(d.lower[m])
		}
		return k, []string{b.String()}
	}
	// In capitals a first word that is a dictionary word ("JURA") is taken when a clear
	// name word follows it ("JURA PRITCHLEY").
	if d.caps && !d.nameToken(j) && d.capsSurname(j) && d.nameToken(j+1) && d.toks[j+1].nl == 0 {
		parts = append(parts, d.lower[j])
		j++
	}
	for len(parts) < 3 && j < len(d.toks) {
		if d.toks[j].nl > 1 && j > i {
			break
		}
		if d.isInitial(j) && len(parts) > 0 && d.nameToken(j+2) {
			j += 2
			continue
		}
		if !d.nameToken(j) && !(len(parts) == 1 && d.capsSurname(j)) {
			break
		}
		parts = append(parts, strings.ToLower(d.word(j)))
		j++
	}
	if len(parts) == 1 && d.lastFirst(j) {
		parts = append(parts, d.lower[j+1])
		j += 2
	}
	return j, parts
}

// cue phrases after which a name is expected.
var nameCues = [][]string{
	{"named"}, {"identified", "as"}, {"identified", "him", "as"}, {"identified", "her", "as"},
	{"identified", "them", "as"}, {"identified", "himself", "as"}, {"identified", "herself", "as"},
	{"known", "as"}, {"aka"}, {"a", ".", "k", ".", "a", "."},
	{"spoke", "with"}, {"spoke", "to"}, {"contacted"}, {"interviewed"}, {"arrested"},
	{"met", "with"}, {"talked", "to"}, {"talked", "with"}, {"reporting", "party"},
	{"victim"}, {"victims"}, {"suspect"}, {"suspects"}, {"driver"}, {"caller"}, {"witness"},
	{"witnesses"}, {"complainant"}, {"subject"}, {"juvenile"}, {"rp"}, {"passenger"},
	{"owner"}, {"resident"}, {"arrestee"}, {"patient"}, {"mother"}, {"father"}, {"son"},
	{"daughter"}, {"wife"}, {"husband"}, {"girlfriend"}, {"boyfriend"}, {"brother"},
	{"sister"}, {"neighbor"}, {"neighbour"}, {"friend"}, {"parent"}, {"guardian"},
	{"employee"}, {"coworker"}, {"supervisor"}, {"manager"},
	{"vic"}, {"vict"}, {"susp"}, {"comp"}, {"compl"}, {"wit"}, {"subj"}, {"keyholder"},
	{"reportee"}, {"registered", "to"}, {"name", "of"}, {"registered", "owner"},
	// police shorthand: V/ victim, S/ suspect, R/P reporting party, W/ is "with".
	{"v", "/"}, {"s", "/"}, {"r", "/", "p"},
}

// cuesByFirst indexes nameCues by their first word.
var cuesByFirst = func() map[string][][]string {
	m := map[string][][]string{}
	for _, c := range nameCues {
		m[c[0]] = append(m[c[0]], c)
	}
	return m
}()

// matchCue returns the index after the cue phrase at token i, or -1.
func (d *doc) matchCue(i int, cue []string) int {
	j := i
	for _, w := range cue {
		if j >= len(d.toks) {
			return -1
		}
		if w == "." || w == "/" {
			if !d.isPunct(j, w) {
				return -1
			}
		} else if d.toks[j].kind != tWord || !(strings.EqualFold(d.word(j), w) || longCuePrefix(d.lower[j], w)) {
			return -1
		}
		j++
	}
	return j
}

func (d *doc) addName(cs []cand, si, ei int, parts []string) []cand {
	s, e := d.toks[si].start, d.toks[ei-1].end
	if d.allowed(s, e) {
		return cs
	}
	// "contacted Emergency Medical Services": a run ending in an organisation word whose
	// first word is no given name is not a person.
	if len(parts) >= 2 && orgOnly[parts[len(parts)-1]] && !givenNames[parts[0]] && !surnames[parts[len(parts)-1]] {
		return cs
	}
	return append(cs, cand{typ: Name, start: s, end: e, parts: parts})
}

func (d *doc) names(cs []cand) []cand {
	listsOnce.Do(loadLists)
	cs = d.listNames(cs)
	for i := 0; i < len(d.toks); i++ {
		if d.toks[i].kind != tWord {
			continue
		}
		lw := d.lower[i]
		// titles: "Mr. Quosby", "Dr Ann Lee"; but "Pellinger Dr. Parking ..." is a street.
		if d.flags[i]&fTitle != 0 && !(lw == "dr" && i > 0 && d.toks[i-1].kind != tPunct && (d.toks[i-1].kind == tNum || capitalised(d.word(i-1)) || allUpper(d.word(i-1)) || ordinalRe.MatchString(d.word(i-1)))) {
			j := i + 1
			if d.isPunct(j, ".") {
				if fullTitle[lw] {
					continue // "the duty officer. During ...": a sentence ends
				}
				j++
			}
			if end, parts := d.nameSeq(j); len(parts) > 0 {
				if officerTitle[lw] {
					if !nameLike(parts) {
						continue // "Deputy Forest Supervisor", "Officer Trainee": a job title
					}
					end = d.badgeAfter(end) // "Ofc. Quosby #4412"
				}
				cs = d.addName(cs, j, end, parts)
				i = end - 1
			} else if d.caps && d.capsSurname(j) {
				cs = d.addName(cs, j, j+1, []string{d.lower[j]}) // "MS. STONE"
				i = j
			}
			continue
		}
		var cues [][]string
		if d.flags[i]&fNameCue != 0 {
			cues = cuesByFirst[lw]
		}
		if len(lw) >= 8 && cues == nil && !lexicon.Has(lw) {
			cues = cuesByFirst[longCues[lw[:8]]] // "identifiecl as": OCR noise in a long cue
		}
		for _, cue := range cues {
			j := d.matchCue(i, cue)
			if j < 0 {
				continue
			}
			// filler: punctuation and numbers ("Victim #1, Ann Lee", "suspect (S1) ...").
			for k := 0; k < 4 && j < len(d.toks); k++ {
				t := d.toks[j]
				if t.kind == tNum || (t.kind == tPunct && strings.ContainsAny(d.word(j), ",:-#()")) {
					j++
					continue
				}
				break
			}
			if end, parts := d.nameSeq(j); len(parts) > 0 {
				// "Coworker #1", "Unit 12": a label, not a name; "contacted Dispatch": an
				// ordinary word, not a name.
				if !d.roleLabel(end, parts) && nameLike(parts) {
					cs = d.addName(cs, j, end, parts)
				}
				i = end - 1
			}
			break
		}
	}
	if !d.r.opt.NoHeuristicNames {
		if d.caps {
			cs = d.capsNames(cs)
		} else {
			cs = d.heuristicNames(cs)
		}
	}
	if d.r.opt.Types.Has(Age) {
		cs = d.agesAfterNames(cs)
	}
	return cs
}

// initialsAt returns the index after a run of initials starting at token j ("J.D.",
// "J. D."), or j when there is none.
func (d *doc) initialsAt(j int) int {
	k := j
	for d.isInitial(k) {
		k += 2
	}
	return k
}

// agesAfterNames finds an age written right after a name: "Ann Quosby (45)",
// "Ann Quosby, 45, of ...".
func (d *doc) agesAfterNames(cs []cand) []cand {
	n := len(cs)
	for _, c := range cs[:n] {
		if c.typ != Name {
			continue
		}
		i := d.tokenAt(c.end)
		switch {
		case d.isPunct(i, "(") && i+2 < len(d.toks) && d.toks[i+1].kind == tNum && d.isPunct(i+2, ")"):
			if v := d.toks[i+1].end - d.toks[i+1].start; v <= 2 {
				cs = append(cs, cand{typ: Age, start: d.toks[i].start, end: d.toks[i+2].end})
			}
		case d.isPunct(i, ",") && i+2 < len(d.toks) && d.toks[i+1].kind == tNum && d.isPunct(i+2, ","):
			if v := d.toks[i+1].end - d.toks[i+1].start; v <= 2 && d.toks[i+1].start > d.toks[i].end {
				cs = append(cs, cand{typ: Age, start: d.toks[i+1].start, end: d.toks[i+1].end})
			}
		}
	}
	return cs
}

// sentenceStart reports whether token i begins a sentence.
func (d *doc) sentenceStart(i int) bool {
	j := i - 1
	for j >= 0 && d.toks[j].kind == tPunct && strings.ContainsAny(d.word(j), "\"'“‘([") {
		j--
	}
	if j < 0 || d.toks[j+1].nl > 0 {
		return true
	}
	if d.toks[j].kind == tPunct && strings.ContainsAny(d.word(j), ".!?;:*•-") {
		if d.word(j) == "." && j > 0 && d.toks[j-1].kind == tWord {
			w := strings.ToLower(d.word(j - 1))
			if titleWords[w] || len(w) == 1 {
				return false
			}
		}
		return true
	}
	return false
}

// heuristicNames finds capitalised words missing from the dictionary where a name stands:
// runs of two to four capitalised words one of which is a known given name or not a
// dictionary word, or a single such word inside a sentence.
func (d *doc) heuristicNames(cs []cand) []cand {
	for i := 0; i < len(d.toks); i++ {
		if d.toks[i].kind != tWord || !capitalised(d.word(i)) {
			continue
		}
		// collect the run.
		var idx []int
		j := i
		for j < len(d.toks) {
			if d.toks[j].kind == tWord && capitalised(d.word(j)) && (j == i || d.toks[j].nl == 0) {
				idx = append(idx, j)
				j++
				continue
			}
			if len(idx) > 0 && d.isInitial(j) && d.toks[j+1].end < len(d.text) && j+2 < len(d.toks) && capitalised(d.word(j+2)) {
				j += 2
				continue
			}
			break
		}
		next := j
		i = j - 1
		if len(idx) > 4 {
			continue
		}
		// an org or place word anywhere, or a number before, makes it not a person.
		org := false
		for _, k := range idx {
			if orgWords[d.lower[k]] {
				org = true
			}
		}
		if next < len(d.toks) && d.toks[next].kind == tWord && orgWords[d.lower[next]] {
			org = true
		}
		if org || (idx[0] > 0 && d.toks[idx[0]-1].kind == tNum) {
			continue
		}
		// a model number after, or ", MN" (a place), marks a thing; a phone number does not.
		if next < len(d.toks) && d.toks[next].kind == tNum && !d.phoneAhead(next) {
			continue
		}
		if d.isPunct(next, ",") && next+1 < len(d.toks) && usStates[d.word(next+1)] {
			continue
		}
		// drop leading stop words and sentence-initial dictionary words.
		for len(idx) > 0 {
			lw := d.lower[idx[0]]
			sentence := d.sentenceStart(idx[0]) && isDictLower(lw) && !givenNames[lw]
			title := len(idx) >= 3 && isCommonLower(lw) && !givenNames[lw] // "Firefighter Eva Schicke"
			if stopNames[lw] || titleWords[lw] || sentence || title {
				idx = idx[1:]
				continue
			}
			break
		}
		if len(idx) == 0 {
			continue
		}
		// a determiner or preposition before marks a thing: "the Rooftop Rigger".
		if idx[0] > 0 && d.toks[idx[0]-1].kind == tWord {
			if p := d.lower[idx[0]-1]; thingBefore[p] || (p == "called" && !d.personCalled(idx[0]-1)) {
				continue
			}
		}
		for len(idx) > 0 && stopNames[d.lower[idx[len(idx)-1]]] {
			idx = idx[:len(idx)-1]
		}
		if len(idx) == 0 {
			continue
		}
		nonDict, listed := 0, 0
		var parts []string
		for _, k := range idx {
			lw := d.lower[k]
			if stopNames[lw] {
				nonDict = -100 // a stop word inside the run: not a name
			}
			if !isDictLower(lw) {
				nonDict++
			}
			if givenNames[lw] || surnames[lw] {
				listed++
			}
			parts = append(parts, lw)
		}
		first := d.lower[idx[0]]
		ok := false
		if len(idx) >= 2 {
			// given-name position and surname position must both look like names.
			fw, lw := d.word(idx[0]), d.word(idx[len(idx)-1])
			firstOK := givenNames[first] || !isDictWord(fw) || givenNames[strings.SplitN(first, "-", 2)[0]] // "Mary-Jane"
			lastOK := surnames[strings.ToLower(lw)] || !isCommonWord(lw)
			// a person's context before or a person's verb after vouches for a surname that
			// is also a dictionary word ("Staff called Tamo Bromley").
			prev := ""
			if idx[0] > 0 && d.toks[idx[0]-1].kind == tWord {
				prev = d.lower[idx[0]-1]
			}
			last := idx[len(idx)-1]
			verb := last+1 < len(d.toks) && d.toks[last+1].kind == tWord && personVerbs[d.lower[last+1]]
			if firstOK && !lastOK && (personBefore[prev] || verb) && !orgWords[strings.ToLower(lw)] {
				lastOK = true
			}
			// a known given name that is no ordinary word vouches for the surname: "Rick Moon".
			if len(idx) == 2 && givenNames[first] && !isCommonWord(fw) && !orgWords[strings.ToLower(lw)] {
				lastOK = true
			}
			ok = nonDict >= 1 && firstOK && lastOK
			// "Crystal Nwachurin explained": a surname no dictionary knows and a person's
			// verb after it.
			if !ok && !isDictWord(lw) && verb && strongVerbs[d.lower[last+1]] {
				ok = true
			}
			if d.quoted(idx[0], idx[len(idx)-1]) {
				ok = false
			}
		} else {
			w := d.word(idx[0])
			prev := ""
			if idx[0] > 0 && d.toks[idx[0]-1].kind == tWord {
				prev = strings.ToLower(d.word(idx[0] - 1))
			}
			// a single word needs a person's verb after it or a person's context before it,
			// and must not be a misspelt common word ("Nieghbors stated").
			ok = nonDict >= 1 && utf8.RuneCountInString(w) >= 3 && !placePrepsBefore[prev] && !d.quoted(idx[0], idx[0])
			verb := next < len(d.toks) && d.toks[next].kind == tWord && strongVerbs[d.lower[next]]
			// "Hollifax, Carlos told me": LAST, First.
			if nonDict >= 1 && d.lastFirst(next) && !placePrepsBefore[prev] {
				parts = append(parts, d.lower[next+1])
				cs = d.addName(cs, idx[0], next+2, parts)
				i = next + 1
				continue
			}
			ok = ok && (verb || personBefore[prev]) && !nearCommonWordCached(d.lower[idx[0]])
		}
		if ok {
			cs = d.addName(cs, idx[0], idx[len(idx)-1]+1, parts)
		}
	}
	return cs
}

// listNames finds the caller's listed names: whole entries (each word exact, or one edit
// away for words of five or more letters) and single capitalised words of an entry.
func (d *doc) listNames(cs []cand) []cand {
	ix := d.r.index
	if ix == nil {
		return cs
	}
	var hits []listWord
	for i := range d.toks {
		if d.toks[i].kind != tWord {
			continue
		}
		w := d.word(i)
		// misspellings are looked for only in capitalised words that are not ordinary words.
		fuzzy := (capitalised(w) || allUpper(w)) && !isDictWord(w)
		hits = ix.lookup(d.lower[i], fuzzy, hits[:0])
		if len(hits) == 0 {
			continue
		}
		done := false
		// whole entries starting here
		for _, h := range hits {
			ws := d.r.list[h.entry]
			if h.word != 0 || len(ws) < 2 {
				continue
			}
			j, k := i+1, 1
			if d.isInitial(j) {
				j += 2
			}
			for k < len(ws) && j < len(d.toks) && d.toks[j].kind == tWord && wordMatch(d.word(j), ws[k]) {
				k++
				j++
				if k < len(ws) && d.isInitial(j) {
					j += 2
				}
			}
			if k == len(ws) {
				cs = d.addName(cs, i, j, append([]string(nil), ws...))
				done = true
				break
			}
		}
		if done {
			continue
		}
		// a single word of an entry, written with a capital (or in capitals); a one-word
		// entry matches in any case unless it is a dictionary word. Followed by a street suffix or a business word
		// ("Hallowmere Cir", "Tarrowby Hardware") it names a place, not the person.
		if n := i + 1; n < len(d.toks) && d.toks[n].kind == tWord && (d.flags[n]&fSuffix != 0 || orgOnly[d.lower[n]]) {
			continue
		}
		for _, h := range hits {
			ws := d.r.list[h.entry]
			if (len(ws) > 1 || isDictWord(ws[0])) && !(capitalised(w) || allUpper(w)) {
				continue // a listed "Will" or "Rose" is not the verb or the flower
			}
			if l := ws[h.word]; len(l) >= 2 && !stopNames[l] {
				cs = d.addName(cs, i, i+1, []string{l})
				break
			}
		}
	}
	return cs
}

// listWord is word k of list entry e.
type listWord struct{ entry, word int }

// listIndex finds list words equal to, or (for five or more letters) one edit from, a word.
type listIndex struct {
	exact map[string][]listWord
	long  []string // distinct list words of five or more letters
	where map[string][]listWord
}

func newListIndex(list [][]string) *listIndex {
	ix := &listIndex{exact: map[string][]listWord{}, where: map[string][]listWord{}}
	for e, ws := range list {
		for k, w := range ws {
			lw := ws[k]
			ix.exact[lw] = append(ix.exact[lw], listWord{e, k})
			if utf8.RuneCountInString(w) >= 5 {
				if _, ok := ix.where[lw]; !ok {
					ix.long = append(ix.long, lw)
				}
				ix.where[lw] = append(ix.where[lw], listWord{e, k})
			}
		}
	}
	return ix
}

// lookup appends to dst the list words matching the lower-case word lw.
func (ix *listIndex) lookup(lw string, fuzzy bool, dst []listWord) []listWord {
	dst = append(dst, ix.exact[lw]...)
	if !fuzzy || len(lw) < 4 {
		return dst
	}
	for _, l := range ix.long {
		if l == lw || len(l)-len(lw) > 1 || len(lw)-len(l) > 1 {
			continue
		}
		if editWithin1(lw, l) {
			dst = append(dst, ix.where[l]...)
		}
	}
	return dst
}

// wordMatch reports whether w equals the lower-case listed word l ignoring case, or, when
// l has at least five letters, is within one edit of it.
func wordMatch(w, l string) bool {
	if strings.EqualFold(w, l) {
		return true
	}
	if utf8.RuneCountInString(l) < 5 {
		return false
	}
	return editWithin1(strings.ToLower(w), l)
}

// editWithin1 reports whether a and b are at most one edit apart, where an edit is the
// substitution, insertion or deletion of one rune or the swap of two neighbouring runes
// (optimal string alignment distance, Damerau 1964).
func editWithin1(a, b string) bool {
	if isASCII(a) && isASCII(b) {
		return editWithin1Bytes([]byte(a), []byte(b))
	}
	return editWithin1Runes([]rune(a), []rune(b))
}

func isASCII(s string) bool {
	for i := 0; i < len(s); i++ {
		if s[i] >= 0x80 {
			return false
		}
	}
	return true
}

func editWithin1Bytes(ra, rb []byte) bool {
	if len(ra) < len(rb) {
		ra, rb = rb, ra
	}
	switch len(ra) - len(rb) {
	case 0:
		i := 0
		for i < len(ra) && ra[i] == rb[i] {
			i++
		}
		if i == len(ra) {
			return true
		}
		if string(ra[i+1:]) == string(rb[i+1:]) {
			return true // substitution
		}
		return i+1 < len(ra) && ra[i] == rb[i+1] && ra[i+1] == rb[i] && string(ra[i+2:]) == string(rb[i+2:])
	case 1:
		i := 0
		for i < len(rb) && ra[i] == rb[i] {
			i++
		}
		return string(ra[i+1:]) == string(rb[i:])
	}
	return false
}

func editWithin1Runes(ra, rb []rune) bool {
	if len(ra) < len(rb) {
		ra, rb = rb, ra
	}
	switch len(ra) - len(rb) {
	case 0:
		var diff []int
		for i := range ra {
			if ra[i] != rb[i] {
				diff = append(diff, i)
				if len(diff) > 2 {
					return false
				}
			}
		}
		switch len(diff) {
		case 0, 1:
			return true
		case 2:
			i, j := diff[0], diff[1]
			return j == i+1 && ra[i] == rb[j] && ra[j] == rb[i]
		}
		return false
	case 1:
		i := 0
		for i < len(rb) && ra[i] == rb[i] {
			i++
		}
		for j := i; j < len(rb); j++ {
			if ra[j+1] != rb[j] {
				return false
			}
		}
		return true
	}
	return false
}

// nameWords returns the words of a name span worth finding on their own elsewhere: each
// word of two or more letters that is not a title or stop word, as written and in capitals.
func (d *doc) nameWords(s, e int) []string {
	var out []string
	for i := d.tokenAt(s); i < len(d.toks) && d.toks[i].end <= e; i++ {
		if d.toks[i].kind != tWord {
			continue
		}
		w := d.word(i)
		lw := strings.ToLower(w)
		if utf8.RuneCountInString(w) < 2 || stopNames[lw] || titleWords[lw] {
			continue
		}
		out = append(out, w)
		if u := strings.ToUpper(w); u != w && len(u) == len(w) {
			out = append(out, u)
		}
	}
	return out
}

// quoted reports whether tokens i..j are wrapped in quotation marks.
func (d *doc) quoted(i, j int) bool {
	q := func(k int) bool {
		return k >= 0 && k < len(d.toks) && d.toks[k].kind == tPunct && strings.ContainsAny(d.word(k), "\"“”'‘’")
	}
	return q(i-1) && q(j+1)
}

// personCalled reports whether "called" at token i means "telephoned" or "named" a person
// ("Staff called Tamo Bromley") rather than naming a thing ("a machine called a Sreco"):
// it is preceded by a word that is not a determiner or a noun for a thing.
func (d *doc) personCalled(i int) bool {
	if i == 0 || d.toks[i-1].kind != tWord {
		return true
	}
	switch d.lower[i-1] {
	case "machine", "device", "tool", "product", "chemical", "pesticide", "substance", "cleaner", "system", "unit", "equipment":
		return false
	}
	return true
}

// capsNames is the heuristic for narratives written in capitals, where capitalisation says
// nothing: a known given name followed by one or two words that are not dictionary words
// or are known surnames ("JOHN QUOSBY", "MARIA T. DELLWICK").
func (d *doc) capsNames(cs []cand) []cand {
	for i := 0; i < len(d.toks); i++ {
		if d.toks[i].kind != tWord || !allUpper(d.word(i)) {
			continue
		}
		if !givenNames[d.lower[i]] {
			// two neighbouring words of four or more letters, neither in the dictionary
			// nor an abbreviation: "TAMO QUOSBY".
			j := i + 1
			if d.isInitial(j) {
				j += 2
			}
			if j < len(d.toks) && d.capsOdd(i) && d.capsOdd(j) && d.toks[j].nl == 0 && (d.personContext(i, j) || d.capsPair(i, j)) {
				cs = d.addName(cs, i, j+1, []string{d.lower[i], d.lower[j]})
				i = j
			}
			continue
		}
		j := i + 1
		if d.isInitial(j) {
			j += 2
		}
		parts := []string{d.lower[i]}
		end := -1
		for k := 0; k < 2 && j < len(d.toks); k++ {
			if d.toks[j].kind != tWord || d.toks[j].nl > 1 {
				break
			}
			w := d.word(j)
			if !allUpper(w) || len(w) < 2 || stopNames[d.lower[j]] || orgWords[d.lower[j]] {
				break
			}
			if isDictWord(w) && !surnames[d.lower[j]] {
				break
			}
			parts = append(parts, d.lower[j])
			end = j + 1
			j++
		}
		if end > 0 {
			cs = d.addName(cs, i, end, parts)
			i = end - 1
		}
	}
	return cs
}

// capsSurname reports whether token j, a dictionary word in capitals right after the first
// word of a cued name, can be taken as the surname ("VICTIM TANELL STONE"): it must not be a
// stop word, a person's verb, or look like a verb form (-ED, -ING).
func (d *doc) capsSurname(j int) bool {
	if j >= len(d.toks) || d.toks[j].kind != tWord || d.toks[j].nl > 0 {
		return false
	}
	w := d.word(j)
	lw := d.lower[j]
	if !allUpper(w) || len(w) < 3 || stopNames[lw] || personVerbs[lw] || orgOnly[lw] {
		return false
	}
	return !strings.HasSuffix(lw, "ed") && !strings.HasSuffix(lw, "ing")
}

// capsOdd reports whether token i is a capitals word of four or more letters, with a vowel,
// that is neither a dictionary word nor a stop, organisation or place word.
func (d *doc) capsOdd(i int) bool {
	if d.toks[i].kind != tWord {
		return false
	}
	w := d.word(i)
	lw := d.lower[i]
	if len(w) < 4 || !allUpper(w) || isDictWord(w) || stopNames[lw] || orgWords[lw] {
		return false
	}
	return strings.ContainsAny(lw, "aeiouy")
}

// personContext reports whether the words before token i or after token j say that
// tokens i..j are a person: "saw", "told", "asked" ... before, or "said", "told" ... after.
func (d *doc) personContext(i, j int) bool {
	if i > 0 && d.toks[i-1].kind == tWord && personBefore[d.lower[i-1]] && d.lower[i-1] != "and" {
		return true
	}
	if i > 1 && d.toks[i-1].kind == tWord && d.lower[i-1] == "to" && d.toks[i-2].kind == tWord && d.lower[i-2] == "belonged" {
		return true
	}
	return j+1 < len(d.toks) && d.toks[j+1].kind == tWord && personVerbs[d.lower[j+1]]
}

// nameLike reports whether some word of a cued name is a known name or not a common word.
func nameLike(parts []string) bool {
	for _, p := range parts {
		if givenNames[p] || surnames[p] || !isCommonWord(p) {
			return true
		}
	}
	return false
}

// phoneAhead reports whether token i starts something phone-shaped: three digits followed
// by "-", "." or ")".
func (d *doc) phoneAhead(i int) bool {
	t := d.toks[i]
	if t.kind != tNum || t.end-t.start != 3 {
		return false
	}
	return d.isPunct(i+1, "-") || d.isPunct(i+1, ".") || d.isPunct(i+1, ")")
}

// roleLabel reports whether a one-word cued name followed by "#" or a number is a role
// label ("Coworker #1", "Employee 2") rather than a name.
func (d *doc) roleLabel(end int, parts []string) bool {
	if len(parts) != 1 || end >= len(d.toks) || !isCommonWord(parts[0]) {
		return false
	}
	if d.isPunct(end, "#") {
		return true
	}
	t := d.toks[end]
	return t.kind == tNum && (t.end >= len(d.text) || !isAlnumByte(d.text[t.end]))
}

// lastFirst reports whether tokens j, j+1 are ", First" completing "LAST, First": a comma,
// then a capitalised given name or uncommon word, not itself followed by another
// capitalised word (which would make it a list of places or businesses).
func (d *doc) lastFirst(j int) bool {
	if !d.isPunct(j, ",") || j+1 >= len(d.toks) || d.toks[j+1].kind != tWord || d.toks[j+1].nl > 0 {
		return false
	}
	w := d.word(j + 1)
	lw := d.lower[j+1]
	if !(capitalised(w) || (d.caps && allUpper(w))) || stopNames[lw] || orgWords[lw] {
		return false
	}
	if !givenNames[lw] && isCommonWord(w) {
		return false
	}
	if k := j + 2; k < len(d.toks) && d.toks[k].kind == tWord && d.toks[k].nl == 0 && (capitalised(d.word(k)) || usStates[d.word(k)]) {
		return false
	}
	return true
}

// nearCommonWord reports whether lw, of six or more letters, is one edit (a deletion,
// insertion, substitution or swap of neighbours) away from a dictionary word: a misspelling
// rather than a name.
func nearCommonWord(lw string) bool {
	if len(lw) < 6 || !isASCII(lw) {
		return false
	}
	b := []byte(lw)
	try := func(s []byte) bool { return lexicon.Has(string(s)) }
	buf := make([]byte, 0, len(b)+1)
	for i := range b {
		buf = append(append(buf[:0], b[:i]...), b[i+1:]...) // deletion
		if try(buf) {
			return true
		}
		if i+1 < len(b) {
			buf = append(buf[:0], b...)
			buf[i], buf[i+1] = buf[i+1], buf[i] // swap
			if try(buf) {
				return true
			}
		}
		for c := byte('a'); c <= 'z'; c++ {
			if c == b[i] {
				continue
			}
			buf = append(buf[:0], b...)
			buf[i] = c // substitution
			if try(buf) {
				return true
			}
		}
	}
	for i := 0; i <= len(b); i++ {
		for c := byte('a'); c <= 'z'; c++ {
			buf = append(append(append(buf[:0], b[:i]...), c), b[i:]...) // insertion
			if try(buf) {
				return true
			}
		}
	}
	return false
}

// nearCache remembers nearCommonWord's answers (a pure function of the word and the fixed
// word list), up to nearCacheMax words, so that a name seen in many narratives is checked
// once.
var (
	nearCache  sync.Map // string → bool
	nearCached atomic.Int64
)

const nearCacheMax = 1 << 16

func nearCommonWordCached(lw string) bool {
	if v, ok := nearCache.Load(lw); ok {
		return v.(bool)
	}
	near := nearCommonWord(lw)
	if nearCached.Load() < nearCacheMax {
		if _, loaded := nearCache.LoadOrStore(strings.Clone(lw), near); !loaded {
			nearCached.Add(1)
		}
	}
	return near
}

// longCues maps the first eight letters of the long cue words to the words.
var longCues = map[string]string{"identifi": "identified", "complain": "complainant", "register": "registered", "intervie": "interviewed"}

// longCuePrefix reports whether the word lw, of the lower-case cue word w of eight or more
// letters, shares w's first eight letters and is within two letters of its length: OCR
// noise at the end of a long cue ("identifiecl").
func longCuePrefix(lw, w string) bool {
	if len(w) < 8 || len(lw) < 8 || lw[:8] != w[:8] || lexicon.Has(lw) {
		return false // "complaint" is a word, not a noisy "complainant"
	}
	d := len(lw) - len(w)
	return d >= -2 && d <= 2
}

// badgeAfter returns the index after a badge number that follows token end-1 ("#4412",
// "(#4412)", "badge 4412"), or end when there is none.
func (d *doc) badgeAfter(end int) int {
	j := end
	if d.isPunct(j, "(") {
		j++
	}
	if j < len(d.toks) && d.toks[j].kind == tWord && d.lower[j] == "badge" {
		j++
	}
	if d.isPunct(j, "#") {
		j++
	}
	if j > end && j < len(d.toks) && d.toks[j].kind == tNum {
		j++
		if d.isPunct(end, "(") && d.isPunct(j, ")") {
			j++
		}
		return j
	}
	return end
}

// technicalEndings are word endings common in technical and medical terms and rare in
// given names and surnames.
var technicalEndings = []string{"ion", "ity", "ism", "ide", "ate", "ent", "ant", "ic", "al", "ous", "ive", "ary", "ory", "ine", "ene", "ane", "ose", "ase", "osis", "itis", "emia", "ics", "ure", "ing", "ed", "er", "or", "ers", "ors", "ment", "ness", "able", "ible", "ly"}

// nameShaped reports whether lw ends in none of technicalEndings: in capitals, two such
// uncommon words side by side are taken as a name ("TAMO QUOSBY").
func nameShaped(lw string) bool {
	for _, e := range technicalEndings {
		if strings.HasSuffix(lw, e) {
			return false
		}
	}
	return true
}

// capsPair reports whether capitals words i and j, both uncommon, look like a name without
// a person's context: both name-shaped, no third such word after them, and no article,
// preposition or number before them ("THE CRUCIBLE TRAIN", "FROM CARDIAC TAMPONADE").
func (d *doc) capsPair(i, j int) bool {
	if !nameShaped(d.lower[i]) || !nameShaped(d.lower[j]) {
		return false
	}
	if j+1 < len(d.toks) && d.toks[j+1].kind == tWord && d.capsOdd(j+1) {
		return false
	}
	if i > 0 {
		p := d.toks[i-1]
		if p.kind == tNum {
			return false
		}
		if p.kind == tWord {
			if w := d.lower[i-1]; thingBefore[w] || placePrepsBefore[w] || w == "by" || w == "with" {
				return false
			}
		}
	}
	return true
}
