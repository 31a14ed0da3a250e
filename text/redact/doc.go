// Package redact finds personal information in incident narratives and replaces it with
// typed placeholders such as [NAME-1], [PHONE] and [ADDRESS], keeping an audit of every
// replacement.
//
// A Redactor built with New runs a fixed set of detectors over a narrative:
//
//   - phone numbers in North American Numbering Plan form (area code and exchange start
//     with 2-9, per the NANPA/ATIS numbering guidelines, recalled from memory), with
//     extensions; a bare ten- or seven-digit number only next to a cue such as "phone";
//   - e-mail addresses: the dot-atom form of RFC 5322 section 3.4.1 (no quoted local
//     parts, no address literals) with a dotted domain ending in two or more letters;
//   - Social Security numbers, skipping what the Social Security Administration never
//     issues: area 000, 666 and 900-999, group 00, serial 0000; undashed only after a cue;
//   - dates of birth (a date after "DOB", "D.O.B.", "date of birth", "born") and ages
//     ("23 y/o", "age 45", "45 yoa", "45-year-old");
//   - vehicle plates after a cue ("plate", "tag", "registration", "reg", "lic") and VINs:
//     17 characters without I, O and Q whose check digit (49 CFR 565.15) is right, or any
//     VIN-shaped string after "VIN";
//   - street addresses (house number, street name, a USPS Publication 28 suffix) and
//     intersections ("Elm St and 4th Ave", "Main/Oak", "the corner of X and Y");
//   - case and incident numbers after a cue ("case #24-001234", "report 21-3456");
//   - people's names: from the caller's list (exact, case-insensitive, and within one edit
//     for names of five or more letters), after cues ("Mr.", "named", "victim", "spoke
//     with" ...), and capitalised words that are not in the embedded English word list
//     when they stand where a name stands. Options.Allow keeps street, business and place
//     names. Officers' names are redacted like anyone's, after "Officer", "Ofc.", "Sgt.",
//     "Det.", "Deputy" ..., together with a badge number written after them ("Ofc.
//     Quosby #4412"); list officers in Allow when the report must show them.
//
// Detectors read a copy of the narrative in which HTML residue ("&nbsp;", "<br />") is
// blanked and a non-word one letter away from a cue word ("casc", "platc", "registrati0n")
// is spelled as the cue, byte for byte, so offsets always refer to the text as given. Names
// in capitals ("JOHN QUOSBY") and "LAST, First" forms are handled; the capitalised-word
// guess is weaker in all-capital narratives, where it needs a known given name or a
// person's context ("saw", "told").
//
// Overlapping finds are resolved by a fixed priority, then length, then position. Names are
// numbered in order of first appearance within one narrative, and a later mention of a
// part of a name ("Smith" after "John Smith") gets the same number. Any other occurrence of
// a replaced text is replaced too, so no detected text survives elsewhere in the output.
// Redact is deterministic and idempotent: it repeats its detectors on its own output until
// nothing new is found, and placeholders are never detected.
//
// Redaction misses things. Read Cautions before publishing anything redacted with it.
//
// Measured quality (see quality_test.go; the benchmark JSON lines come from
// `go test -run 'Quality|FalsePositives|OSHA' -v ./text/redact/ | grep '^{'`): on the
// generated test set every structured type is found at least 99.5% of the time and listed
// names always; on the OSHA accident abstracts, which name almost no one, fewer than 0.1
// redactions per 1,000 tokens are not ages.
//
// Word lists: the English word list of package lexicon (see text/lexicon for its sources: the
// Snowball English sample vocabulary, lower-case words of the SAFENET reports, and a
// hand-written supplement) and names_en.txt (common US given names and surnames, written from memory).
package redact
