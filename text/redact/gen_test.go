package redact

import (
	"fmt"
	"math/rand/v2"
	"strings"
)

// The generated PII test set: invented people, streets and numbers planted in incident-style
// sentences, with the exact span of each planted item. Phones use only the fictional line
// numbers 555-0100..555-0199, e-mail only example.com/.org/.net. SSN-shaped numbers are
// random, exist only in memory during the test and are never written out.

// Name kinds of the generated set.
const (
	kindListed    = "listed"
	kindCue       = "cue"
	kindHeuristic = "heuristic"
)

type genSpan struct {
	Span
	kind string
}

type genDoc struct {
	text  string
	truth []genSpan
}

type gen struct {
	r      *rand.Rand
	b      strings.Builder
	truth  []genSpan
	listed []string // the listed people (full names), passed as Options.Names
}

func (g *gen) lit(s string) { g.b.WriteString(s) }

func (g *gen) pii(t Type, kind, s string) {
	st := g.b.Len()
	g.b.WriteString(s)
	g.truth = append(g.truth, genSpan{Span{Type: t, Start: st, End: g.b.Len(), Text: s}, kind})
}

func (g *gen) pick(xs []string) string { return xs[g.r.IntN(len(xs))] }

var (
	sylA = []string{"Ta", "Vor", "Mi", "Qua", "Bre", "Zel", "Ori", "Fen", "Dar", "Ly", "Sa", "Ri", "Nel", "Tho", "Cai", "Ju", "Ves", "Kor", "Pel", "Ysa", "Gor", "Hal", "Ivo", "Ulm"}
	sylB = []string{"nell", "ric", "ra", "lin", "don", "via", "sha", "mo", "ren", "tessa", "lo", "vik", "dine", "bel", "ros", "ny"}
	surA = []string{"Quos", "Varn", "Dell", "Mott", "Krel", "Ashv", "Brom", "Tull", "Ferr", "Gasp", "Holv", "Jenn", "Lask", "Ombr", "Pritch", "Wendl", "Zarn", "Cadw", "Elsb", "Niv"}
	surB = []string{"by", "sky", "wick", "ton", "ley", "ford", "man", "ez", "ova", "ing", "quist", "ard", "enko", "ell", "aro"}
	// cue-only surnames that are also ordinary words.
	wordSurnames = []string{"Baker", "Marsh", "Fields", "Stone", "Rivers", "Hill", "Brook", "Wells"}
	streets      = []string{"Elm", "Maple", "Birchwood", "Larkspur", "Quillon", "4th", "12th", "Cedar Hollow", "Ostrander", "Pell", "Wexmoor", "Juniper"}
	suffixes     = []string{"St", "St.", "Street", "Ave", "Avenue", "Rd", "Road", "Blvd", "Dr", "Drive", "Ln", "Lane", "Ct", "Way", "Pl", "Ter", "Pkwy", "Cir"}
)

func (g *gen) given() string { return g.pick(sylA) + g.pick(sylB) }
func (g *gen) surname() string {
	if g.r.IntN(6) == 0 {
		return g.pick(surA) + g.pick(surB) + "-" + g.pick(surA) + g.pick(surB)
	}
	return g.pick(surA) + g.pick(surB)
}

func (g *gen) phone() string {
	area := g.pick([]string{"555", "202", "312", "415", "617", "713", "808", "919"})
	line := fmt.Sprintf("01%02d", g.r.IntN(100))
	var s string
	switch g.r.IntN(6) {
	case 0:
		s = "(" + area + ") 555-" + line
	case 1:
		s = area + "-555-" + line
	case 2:
		s = area + ".555." + line
	case 3:
		s = "+1 " + area + " 555 " + line
	case 4:
		s = "(" + area + ")555-" + line
	default:
		s = "1-" + area + "-555-" + line
	}
	switch g.r.IntN(8) {
	case 0:
		s += " ext. " + fmt.Sprint(g.r.IntN(900)+1)
	case 1:
		s += " x" + fmt.Sprint(g.r.IntN(90)+10)
	}
	return s
}

func (g *gen) ssnDigits() (string, string, string) {
	var a int
	for a == 0 || a == 666 {
		a = g.r.IntN(899) + 1
	}
	return fmt.Sprintf("%03d", a), fmt.Sprintf("%02d", g.r.IntN(99)+1), fmt.Sprintf("%04d", g.r.IntN(9999)+1)
}

func (g *gen) vin() string {
	const chars = "ABCDEFGHJKLMNPRSTUVWXYZ0123456789"
	b := make([]byte, 17)
	for i := range b {
		b[i] = chars[g.r.IntN(len(chars))]
	}
	c, _ := VINCheckDigit(string(b))
	b[8] = c
	return string(b)
}

func (g *gen) date() string {
	y, m, d := 1940+g.r.IntN(65), g.r.IntN(12)+1, g.r.IntN(28)+1
	months := []string{"January", "February", "March", "April", "May", "June", "July", "August", "September", "October", "November", "December"}
	switch g.r.IntN(6) {
	case 0:
		return fmt.Sprintf("%02d/%02d/%d", m, d, y)
	case 1:
		return fmt.Sprintf("%d/%d/%02d", m, d, y%100)
	case 2:
		return fmt.Sprintf("%d-%02d-%02d", y, m, d)
	case 3:
		return fmt.Sprintf("%s %d, %d", months[m-1], d, y)
	case 4:
		return fmt.Sprintf("%d %s %d", d, months[m-1], y)
	default:
		return fmt.Sprintf("%s. %d, %d", months[m-1][:3], d, y)
	}
}

func (g *gen) plate() string {
	const L, D = "ABCDEFGHJKLMNPRSTUVWXYZ", "0123456789"
	c := func(set string, n int) string {
		b := make([]byte, n)
		for i := range b {
			b[i] = set[g.r.IntN(len(set))]
		}
		return string(b)
	}
	switch g.r.IntN(4) {
	case 0:
		return c(D, 1) + c(L, 3) + c(D, 3)
	case 1:
		return c(L, 3) + "-" + c(D, 4)
	case 2:
		return c(L, 3) + c(D, 4)
	default:
		return c(D, 3) + c(L, 3)
	}
}

func (g *gen) street() string { return g.pick(streets) + " " + g.pick(suffixes) }

// personName returns an invented full name.
func (g *gen) personName() string {
	if g.r.IntN(5) == 0 {
		return g.given() + " " + string(rune('A'+g.r.IntN(26))) + ". " + g.surname()
	}
	return g.given() + " " + g.surname()
}

// typo changes one letter of a word of five or more letters.
func (g *gen) typo(w string) string {
	if len(w) < 5 {
		return w
	}
	i := 1 + g.r.IntN(len(w)-2)
	return w[:i] + string(rune('a'+g.r.IntN(26))) + w[i+1:]
}

// piiFree holds incident-style sentences with no personal information, written for this
// test. They mix capitalised non-person words, numbers, times and vehicle makes.
var piiFree = []string{
	"Units were dispatched to a report of a loud disturbance.",
	"On arrival officers found the front door open and no one inside.",
	"The reporting party stated that the noise had stopped before officers arrived.",
	"EMS evaluated the driver on scene and no transport was needed.",
	"Traffic was diverted for approximately 45 minutes while the roadway was cleared.",
	"Weather was clear and the roadway was dry at the time of the collision.",
	"A silver Toyota Camry and a white Ford F-150 collided in the intersection.",
	"Report taken for insurance purposes only.",
	"Officers checked the area with negative results.",
	"Fire Department personnel arrived at 0932 hours and extinguished the fire.",
	"The store manager provided video of the incident to officers.",
	"Both vehicles were towed from the scene by a contracted wrecker.",
	"The complainant declined to pursue charges at this time.",
	"No injuries were reported and the parties exchanged information.",
	"Dispatch advised that a second caller reported the same vehicle.",
	"The alarm company advised that the rear motion sensor had activated.",
	"Officers cleared the call at 1432 hours.",
	"The suspect vehicle was last seen heading north at a high rate of speed.",
	"A canvass of the neighborhood did not locate any witnesses.",
	"The window had been broken with a rock found on the floor.",
	"Medics treated a minor cut to the left hand.",
	"The juvenile was released to a parent at the station.",
	"Property was photographed and logged into evidence.",
	"The caller stated that two males were fighting in the parking lot.",
	"When officers arrived both males had left the area on foot.",
	"The victim was transported to General Hospital for treatment.",
	"Sergeant on scene requested an additional unit for traffic control.",
	"The Honda Civic had heavy front end damage and was leaking fluid.",
	"A witness stated that the driver ran the red light.",
	"The dog was secured by Animal Control and taken to the shelter.",
	"On Monday morning the school reported graffiti on the east wall.",
	"Approximately 3 feet of fence had been pushed over.",
	"The employee fell about 12 feet from the ladder to the concrete floor.",
	"The forklift operator did not see the worker behind the load.",
	"Power was shut off to the panel before the repair began.",
	"Officers provided a case number and crime prevention tips.",
	"The bicycle was described as a blue mountain bike with a basket.",
	"The subject was cooperative and was cited and released.",
	"A Jeep Wrangler was parked partly on the sidewalk.",
	"In March the same business reported a similar theft.",
}

// generate builds n narratives from seed. Each narrative has two to five sentences, about
// half of them carrying planted items.
func generate(seed uint64, n int) (docs []genDoc, listed []string) {
	r := rand.New(rand.NewPCG(seed, 0x5eed))
	lg := &gen{r: r}
	for i := 0; i < 30; i++ {
		listed = append(listed, lg.given()+" "+lg.surname())
	}
	for i := 0; i < n; i++ {
		g := &gen{r: r, listed: listed}
		k := 2 + r.IntN(4)
		for s := 0; s < k; s++ {
			if s > 0 {
				g.lit(" ")
			}
			if r.IntN(2) == 0 {
				g.lit(g.pick(piiFree))
				continue
			}
			g.sentence()
		}
		text := g.b.String()
		if r.IntN(8) == 0 {
			// an all-capitals narrative, as many CAD exports are; the spans keep their
			// offsets since upper-casing ASCII keeps lengths.
			text = strings.ToUpper(text)
			for k := range g.truth {
				g.truth[k].Text = text[g.truth[k].Start:g.truth[k].End]
				if g.truth[k].kind != "" {
					g.truth[k].kind += "-caps"
				}
			}
		}
		docs = append(docs, genDoc{text: text, truth: g.truth})
	}
	return docs, listed
}

// sentence writes one sentence carrying one or more planted items.
func (g *gen) sentence() {
	switch g.r.IntN(20) {
	case 0:
		g.lit(g.pick([]string{"The caller can be reached at ", "Callback number is ", "The RP gave a phone number of ", "Contact: "}))
		g.pii(Phone, "", g.phone())
		g.lit(".")
	case 1:
		g.lit(g.pick([]string{"The owner asked to be contacted by e-mail at ", "Email provided: ", "The complainant's address is "}))
		loc := strings.ToLower(g.given()) + g.pick([]string{".", "_", ""}) + strings.ToLower(strings.ReplaceAll(g.surname(), "-", ""))
		if g.r.IntN(3) == 0 {
			loc += fmt.Sprint(g.r.IntN(99))
		}
		g.pii(Email, "", loc+"@"+g.pick([]string{"example.com", "example.org", "example.net", "mail.example.com"}))
		g.lit(".")
	case 2:
		a, b, c := g.ssnDigits()
		switch g.r.IntN(3) {
		case 0:
			g.lit("The subject provided SSN ")
			g.pii(SSN, "", a+"-"+b+"-"+c)
		case 1:
			g.lit("SSN: ")
			g.pii(SSN, "", a+b+c)
		default:
			g.lit("Social Security number ")
			g.pii(SSN, "", a+"-"+b+"-"+c)
		}
		g.lit(" was verified through records.")
	case 3:
		g.lit(g.pick([]string{"The driver, DOB ", "Juvenile's D.O.B. is ", "Date of birth: ", "The man said he was born on ", "Subject was born "}))
		g.pii(DOB, "", g.date())
		g.lit(", was checked for warrants.")
	case 4:
		n := 16 + g.r.IntN(70)
		g.lit("The victim, a ")
		switch g.r.IntN(4) {
		case 0:
			g.pii(Age, "", fmt.Sprintf("%d y/o", n))
		case 1:
			g.pii(Age, "", fmt.Sprintf("%d-year-old", n))
		case 2:
			g.pii(Age, "", fmt.Sprintf("%d yoa", n))
		default:
			g.pii(Age, "", fmt.Sprintf("age %d", n))
		}
		g.lit(" female, declined medical treatment.")
	case 5:
		g.lit(g.pick([]string{"The vehicle displayed plate ", "Officers ran tag ", "Registration ", "The car had CA plate ", "Lic# "}))
		g.pii(Plate, "", g.plate())
		g.lit(" and returned to a leased vehicle.")
	case 6:
		v := g.vin()
		if g.r.IntN(4) == 0 {
			// a VIN as written by hand with a wrong check digit: needs the cue.
			b := []byte(v)
			if b[8] == '1' {
				b[8] = '2'
			} else {
				b[8] = '1'
			}
			v = string(b)
			g.lit("VIN ")
		} else {
			g.lit(g.pick([]string{"The VIN was recorded as ", "Vehicle identification number ", "A check of ", "VIN: "}))
		}
		g.pii(VIN, "", v)
		g.lit(" showed no theft record.")
	case 7:
		g.lit(g.pick([]string{"Officers responded to ", "The incident occurred at ", "The burglary happened at "}))
		addr := fmt.Sprint(g.r.IntN(9000)+10) + " "
		if g.r.IntN(4) == 0 {
			addr += g.pick([]string{"N", "S", "E", "W", "North", "NE"}) + " "
		}
		addr += g.street()
		if g.r.IntN(4) == 0 {
			addr += g.pick([]string{" Apt 4B", " Unit 12", " #7", ", Apt. 210"})
		}
		g.pii(Address, "", addr)
		g.lit(" for a report of a theft.")
	case 8:
		switch g.r.IntN(3) {
		case 0:
			g.lit("The crash happened at ")
			g.pii(Address, "", g.street()+" and "+g.street())
		case 1:
			g.lit("The two cars stopped at the corner of ")
			g.pii(Address, "", g.pick(streets)+" and "+g.pick(streets))
		default:
			g.lit("Units met at ")
			g.pii(Address, "", g.pick([]string{"Elm", "Maple", "Pell", "Juniper"})+"/"+g.pick([]string{"Oak", "Cedar", "Wexmoor", "Larkspur"}))
		}
		g.lit(".")
	case 9:
		g.lit(g.pick([]string{"See case #", "Refer to incident no. ", "This is a supplement to report ", "CAD # "}))
		g.pii(CaseNo, "", fmt.Sprintf("%02d-%06d", g.r.IntN(30), g.r.IntN(999999)))
		g.lit(" for details.")
	case 10, 11, 12:
		g.cueName()
	case 13, 14, 15:
		g.listedName()
	default:
		g.heuristicName()
	}
}

func (g *gen) cueName() {
	full := g.personName()
	if g.r.IntN(4) == 0 {
		full = g.given() + " " + g.pick(wordSurnames)
	}
	switch g.r.IntN(8) {
	case 0:
		g.lit("Victim ")
		g.pii(Name, kindCue, full)
		g.lit(" said the door was forced.")
	case 1:
		g.lit("Officers spoke with ")
		g.pii(Name, kindCue, full)
		g.lit(" at the scene.")
	case 2:
		g.lit("The suspect was identified as ")
		g.pii(Name, kindCue, full)
		g.lit(".")
	case 3:
		g.lit(g.pick([]string{"Mr. ", "Ms. ", "Mrs. ", "Dr. "}))
		sur := full[strings.LastIndex(full, " ")+1:]
		g.pii(Name, kindCue, sur)
		g.lit(" was not home.")
	case 4:
		g.lit("The driver, ")
		g.pii(Name, kindCue, full)
		g.lit(", had a suspended licence.")
	case 5:
		g.lit("A man named ")
		g.pii(Name, kindCue, full)
		g.lit(" called twice.")
	case 6:
		g.lit("Witness ")
		g.pii(Name, kindCue, full)
		g.lit(" saw the car leave.")
	default:
		g.lit("Caller ")
		g.pii(Name, kindCue, full)
		g.lit(" reported a prowler.")
	}
}

func (g *gen) listedName() {
	full := g.pick(g.listed)
	sur := full[strings.Index(full, " ")+1:]
	switch g.r.IntN(5) {
	case 0:
		g.lit("Later that night ")
		g.pii(Name, kindListed, full)
		g.lit(" returned to the lot.")
	case 1:
		g.lit("The keys were handed to ")
		g.pii(Name, kindListed, sur)
		g.lit(" by staff.")
	case 2:
		g.lit("Records show ")
		g.pii(Name, kindListed, strings.ToUpper(full))
		g.lit(" was trespassed last year.")
	case 3:
		// a one-letter misspelling of a long surname
		g.lit("A note from ")
		g.pii(Name, kindListed, full[:strings.Index(full, " ")+1]+g.typo(sur))
		g.lit(" was found.")
	default:
		g.lit("The neighbour said ")
		g.pii(Name, kindListed, strings.ToLower(full))
		g.lit(" often parks there.")
	}
}

func (g *gen) heuristicName() {
	full := g.given() + " " + g.surname()
	switch g.r.IntN(8) {
	case 4:
		g.lit("Neighbours described ")
		g.pii(Name, kindHeuristic, full)
		g.lit(" as quiet.")
	case 5:
		g.lit("The car was registered to ")
		g.pii(Name, kindHeuristic, full)
		g.lit(" of Pell Lane.")
	case 6:
		g.pii(Name, kindHeuristic, full)
		g.lit(" had been drinking since noon.")
	case 7:
		g.lit("Messages from ")
		g.pii(Name, kindHeuristic, full)
		g.lit(" were shown to officers.")
	case 0:
		g.lit("A bystander saw ")
		g.pii(Name, kindHeuristic, full)
		g.lit(" near the gate.")
	case 1:
		g.pii(Name, kindHeuristic, full)
		g.lit(" told officers the window was already broken.")
	case 2:
		g.lit("The bag belonged to ")
		g.pii(Name, kindHeuristic, full)
		g.lit(", according to staff.")
	default:
		g.lit("Staff called ")
		g.pii(Name, kindHeuristic, full)
		g.lit(" to come and collect the dog.")
	}
}
