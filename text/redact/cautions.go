package redact

// Cautions says what automatic redaction can and cannot do. The report and the README show
// it wherever redacted narratives are published.
const Cautions = `Redaction here is automatic and it misses things. It replaces what its patterns and word
lists recognise: phone numbers, e-mail addresses, Social Security numbers, dates of birth and
ages, plates and VINs, street addresses and intersections, case numbers and people's names
found from a supplied list, from cues such as "Mr." or "victim", or from capitalised words
that are not ordinary English. It cannot promise that a narrative no longer identifies
anyone:
- It misses names it has no cue for, names that are also ordinary words ("Rose", "Mark"),
  nicknames, misspellings beyond one letter, and names in all-capital text without a cue.
- OCR noise, odd spacing and unusual formats defeat the patterns (a phone number written
  "five five five ...", a date of birth without a cue, an address without a street suffix).
- It also removes some things that are not personal information, such as business names that
  look like surnames; add those to the allow-list.
- In a small place a person can be recognised from context alone: a job, a street, a rare
  event, a date and time, a vehicle, a relationship. Redaction does nothing about that, and
  small counts in tables can identify people too.
- The review file lists every redaction with the original text: it is private, must be named
  so, and must never be published.
Before publishing anything, have a person read a sample of the redacted output with the
review file, and check with counsel, the public-records law that applies, the data-sharing
terms under which the records were obtained, and an ethics review.`
