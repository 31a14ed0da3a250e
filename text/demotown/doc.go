// Package demotown generates the demo corpus: incident narratives from Quillmere, an
// invented town, together with the ground truth that lets tests and benchmarks measure the
// pipeline exactly.
//
// Everything in the corpus is invented: the town, its districts, streets and businesses,
// the people (common given names joined to made-up surnames), phone numbers (only
// 555-0100..555-0199), e-mail addresses (RFC 2606 example domains), plates, VINs, dates of
// birth, case numbers and social security numbers. The sentence templates were written for
// this package in the voice of incident reports; no real report was copied.
//
// # The corpus
//
// Fourteen themes (Corpus.Themes), each with opening, body and closing sentence templates
// that share vocabulary through synonym sets ("vehicle", "contacted", "advised" appear in
// many): traffic stops, welfare checks, noise complaints (Seasonal, peaking in July),
// alarms, animal calls, thefts from vehicles (Rising, from 0.6 to 1.6 times its base share),
// domestic disputes, a person in mental-health crisis, parking complaints, lost and found
// property, trespass, use of force and resisting arrest, shared e-scooter complaints
// (Appearing at AppearMonth, month 24 of 36) and a short routine "checked the area, all
// clear" kind (Residual: it takes the share the others leave, so that the ten Flat themes
// keep exactly the same share every month). A narrative has 1 to 12 sentences; a fifth of the non-routine ones open with
// a dispatch-log line carrying the incident's own date ("On 3/4/2024 at 2130 hrs I was
// dispatched to ..."), a date that is not PII; MixRate of the non-routine narratives take one
// or more body sentences from a second theme (Truth.Themes counts the sentences of each).
// Monthly volumes vary (MonthCounts): summer months are busier. Writers' layout habits vary
// too: a tenth put two spaces between sentences and a tenth break some lines or paragraphs. The
// district column favours a theme's district (60% of its narratives) and the call type
// agrees with the theme 65% of the time (Truth.CallTypeMatches).
//
// Planted on top, each recorded with byte offsets into the final narrative:
//   - PII (Truth.PII; the types are the PII constants) in PIIRate of the non-routine
//     narratives; Truth.NoPII marks the others. A span covers the value only, its cue
//     ("plate", "DOB", "Mr.") stays outside and is recorded as Span.Cue.
//   - abbreviations (Truth.Abbrevs) with their expansions;
//   - OCR-like noise (Truth.Noise) in NoiseRate of the narratives: each content word (four
//     or more lower-case letters, not a stop word, never a name, abbreviation or PII) is
//     hit with probability 1/12, at least one per noisy narrative, by a character
//     confusion, a split or an end-of-line hyphen break. A confusion never yields a word of
//     the corpus's own vocabulary (a split may leave real words: "park ing"). A narrative
//     drawn for noise without any content word passes its turn to the next one;
//   - writers' misspellings ("vehical", "seperated"; Noise events of kind Misspelling) in
//     TypoRate of the narratives: half of the words that have a listed misspelling, at
//     least one. Measure OCR repair on the other kinds;
//   - template copies (Truth.Template), only when Config.TemplateRate is set (the demo
//     command sets DemoTemplateRate): that share of the narratives of six themes is
//     replaced by copies of one text per theme (TemplateFamilies), with a few details
//     (street, vehicle, items, times, an optional sentence) drawn afresh for each copy, as
//     when one writer pastes a saved text into report after report. The narrative keeps
//     its theme, date, district and call type, and the other narratives their clean text;
//   - HTML residue (Truth.HTML) in HTMLRate of the narratives: <p>...</p>, <br />, &nbsp;,
//     &amp; (for "and") and, for an apostrophe, &#39;, &rsquo; or a raw U+2019 (the only
//     non-ASCII text the corpus writes).
//
// The random streams for content, for noise and misspellings, and for HTML are separate
// PCG streams, so changing NoiseRate, TypoRate or HTMLRate leaves the underlying clean
// text unchanged: undoing every recorded Noise and HTML event of a narrative
// (Truth.Restore) gives the narrative generated with those three rates negative.
//
// # Files
//
// incidents.csv (RFC 4180, "\n" line ends) has the columns of Header: incident_id,
// reported (ReportedLayout, M/D/YYYY h:mm AM/PM, in time order), district, call_type,
// narrative, officer_unit.
//
// truth.jsonl is JSON Lines. The first line is {"record":"corpus",...}: town, seed, n,
// months, start (YYYY-MM), appear_month, month_counts, the rates, offsets (a sentence on
// what offsets mean), districts and themes (each with name, label, trend, district,
// call_types and monthly, the theme's probability in each month).
// Each following line is {"record":"incident",...}, one per CSV row in the same order, the
// JSON form of Truth:
//
//	{"record":"incident","id":"QM23-000001","month":0,"theme":"alarm",
//	 "themes":[{"theme":"alarm","sentences":3}],"call_type_matches":true,"no_pii":false,
//	 "pii":[{"type":"phone","start":97,"end":109,"text":"555-555-0142","cue":"at"}],
//	 "noise":[{"kind":"confusion","start":12,"end":18,"noisy":"a1arm","original":"alarm"}],
//	 "html":[{"start":40,"end":46,"residue":"<br />","decoded":"\n","original":" "}],
//	 "abbrevs":[{"start":0,"end":2,"text":"RP","expansion":"reporting party"}]}
//
// Offsets are bytes, [start,end), into the narrative field as decoded from the CSV.
//
// ReadTruth reads truth.jsonl back.
//
// Generate builds a corpus in memory; Stream and StreamDir write any N with memory that
// does not grow with N. The same Config gives byte-identical files.
package demotown
