package demotown

import "strings"

// family is a templated narrative: the text one writer keeps and pastes into report after
// report, changing a few details each time. A sentence that starts with '?' is left out of
// a copy with probability 1/4; slots are drawn afresh for every copy, so copies differ in
// their details (street, vehicle, items, times) but share most of their wording.
type family struct {
	name      string // Truth.Template
	theme     string // the theme whose narratives it replaces
	sentences []string
}

// families are the planted templates, invented for this package. Each replaces a share
// Config.TemplateRate of its theme's narratives. Only the trespass one has a PII slot.
var families = []family{
	{
		name: "vehicle-prowl-form", theme: ThemeVehTheft,
		sentences: []string{
			"Responded to {st} for a theft from a vehicle that happened overnight.",
			"The owner stated {he} parked {his} {color} {make} in front of the residence the evening before and locked it.",
			"In the morning the owner found the rear passenger window smashed and glass on the seat.",
			"Taken from the vehicle: {item} and {item}.",
			"?There were no witnesses and the owner did not know of any cameras on the street.",
			"I photographed the damage and checked the nearby yards for discarded property with negative results.",
			"?The owner was given the incident number and advised to call if the property is offered for sale online.",
		},
	},
	{
		name: "alarm-walkthrough-form", theme: ThemeAlarm,
		sentences: []string{
			"Dispatched to the {business} on {st} for {aalarm} at {time}.",
			"On arrival I walked the perimeter and found every door and window intact.",
			"There were no signs of forced entry and no footprints in the landscaping.",
			"The keyholder arrived at {time} and walked through the building with me.",
			"?Nothing inside appeared disturbed or missing according to the keyholder.",
			"The keyholder reset the panel and said the alarm company would send a technician to look at the {alarm} zone.",
		},
	},
	{
		name: "noise-ordinance-form", theme: ThemeNoise,
		sentences: []string{
			"Responded to a complaint of {noise} coming from a {res} on {st}.",
			"The noise could be heard clearly from the sidewalk when I got out of my patrol car.",
			"?Several neighbors had come out onto their porches because of it.",
			"I knocked and spoke with the resident, who agreed to turn it down.",
			"I explained the town noise ordinance and the quiet hours that begin at ten at night, and that {comp} had called twice.",
			"?I told the resident that a second complaint tonight would lead to a citation.",
			"The resident was polite and the noise had stopped before I returned to my car.",
		},
	},
	{
		name: "driveway-tow-form", theme: ThemeParking,
		sentences: []string{
			"Parking complaint on {st}, a {color} {make} left across the driveway of the caller's home.",
			"The caller said the car had been there since early morning and {he} could not get out for work.",
			"I knocked on doors nearby looking for the owner with no luck.",
			"Dispatch ran the plate and could not reach the registered owner by phone.",
			"?A parking ticket was placed under the wiper blade.",
			"A tow was requested through dispatch and the wrecker hauled the car to the impound lot at {time}.",
		},
	},
	{
		name: "trespass-warning-form", theme: ThemeTrespass,
		sentences: []string{
			"Store security at the {business} on {st} asked for a trespass warning for a {male} who came back after being told to leave earlier in the day.",
			"I met {him} outside the front entrance, where {he} was identified as {NAME}.",
			"I read the written trespass warning aloud and explained that coming back onto the property would mean arrest for criminal trespass.",
			"{he} said {he} understood, signed the form, and walked away {dir} on foot.",
			"?Security kept a copy of the signed warning for their records.",
		},
	},
	{
		name: "control-hold-form", theme: ThemeForce,
		sentences: []string{
			"During the arrest on {st} the subject pulled {his} arms away and tensed {his} body to keep from being handcuffed.",
			"I gave clear verbal commands to stop resisting and put {his} hands behind {his} back.",
			"The subject kept resisting and was taken to the ground in a controlled manner near {place}.",
			"Once on the ground the subject was handcuffed, double locked and checked for injuries.",
			"{ems} evaluated the subject at the scene and found no injuries.",
			"?{sgt} was notified of the use of force and came to the scene.",
			"?My body worn camera was on for the whole contact.",
		},
	},
}

// familyOf maps a theme index to its family, or nil.
var familyOf = buildFamilies()

func buildFamilies() []*family {
	out := make([]*family, len(themeDefs))
	for i := range families {
		f := &families[i]
		found := false
		for t, d := range themeDefs {
			if d.name == f.theme {
				if out[t] != nil {
					panic("demotown: two template families for theme " + f.theme)
				}
				out[t], found = f, true
			}
		}
		if !found {
			panic("demotown: template family for unknown theme " + f.theme)
		}
	}
	return out
}

// TemplateFamilies returns the names of the planted template families (Truth.Template)
// and the theme of each, in a fixed order.
func TemplateFamilies() (names, themes []string) {
	for _, f := range families {
		names = append(names, f.name)
		themes = append(themes, f.theme)
	}
	return names, themes
}

// templated replaces the narrative just planned (its pieces) with a copy of family f. Its
// random choices come from the template stream g.tp, so that the content stream, and with it
// the clean text of every other narrative, is the same as without templates (OCR noise,
// misspellings and HTML residue fall differently once a copy has drawn from their streams).
// A copy keeps one space between sentences (pasted text keeps the layout of the original).
func (g *generator) templated(f *family, tr *Truth) {
	saved := g.r
	g.r = g.tp
	defer func() { g.r = saved }()
	g.pieces = g.pieces[:0]
	g.metas = g.metas[:0]
	g.people = g.people[:0]
	g.animal = ""
	g.female = g.r.IntN(2) == 0
	g.layout = layoutOneSpace
	n := 0
	for _, s := range f.sentences {
		if rest, ok := strings.CutPrefix(s, "?"); ok {
			if g.r.IntN(4) == 0 {
				continue
			}
			s = rest
		}
		if n > 0 {
			g.add(g.sep(), pkSent)
		}
		g.capNext = true
		g.sent = len(g.pieces)
		g.expand(s, 0)
		n++
	}
	tr.Themes = append(tr.Themes[:0], ThemeShare{Theme: f.theme, Sentences: n})
	tr.Template = f.name
}
