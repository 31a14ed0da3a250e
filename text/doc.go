// Package text turns raw incident narratives into the tokens and weighted document-term
// matrices the theme models read, keeping every token traceable to its byte offsets in the
// original narrative.
//
// # Steps
//
// Per narrative (Analyze):
//
//  1. Normalisation: HTML residue (character references such as &nbsp; &amp; &#39;, tags such
//     as <br />, comments) decoded or replaced by a space; Unicode NFKC
//     (golang.org/x/text/unicode/norm); curly quotes, apostrophes, dashes and unusual spaces
//     unified; soft hyphens and zero-width characters dropped. A byte map keeps, for every
//     normalised byte, the span of original bytes it came from.
//  2. Tokenizing (byte-level, ASCII fast path): case folding, line-end hyphenation rejoined
//     ("resi-\ndence" → residence), possessive "'s" stripped, and kinds Word, Number, Time,
//     Date and Code, each non-word kind with a Policy (drop, keep, placeholder).
//  3. Abbreviations: the shipped table (abbrev.txt; common practice, written from memory)
//     plus a user table (ParseAbbrev) expand "veh" → vehicle, "w/" → with, "GOA" → gone on
//     arrival; expanded words keep the abbreviation's span.
//
// Corpus-level (Build), in this order after the above:
//
//  0. Boilerplate sentences (Settings.Sentences; off by default): every narrative is cut into
//     sentences at the punctuation between its tokens and each sentence keyed by its words
//     (package sentences); a key found in enough narratives, and with Repeats a sentence
//     repeated within its narrative, is set aside: its tokens never reach the steps below
//     and a break stands in their place. The keys are saved in the Frozen pipeline, so tagging
//     sets the same sentences aside; Corpus.Sentences accounts for them.
//  4. Split words rejoined ("veh icle" → vehicle) when the join is a frequent corpus word and
//     neither part is; OCR repair of rare words to a frequent word or a user word (package
//     repair), only when unambiguous. Every correction is counted in Corpus.Audit
//     (WriteAudit writes CSV). Repair.Enabled switches both off.
//  5. Stopwords (package stopwords: English, incident boilerplate, user words) and a minimum
//     length; protected tokens (codes, placeholders) are never stopped or stemmed.
//  6. Stemming with the Snowball English (Porter2) stemmer (github.com/kljensen/snowball),
//     memoised; each stem is shown by its most frequent surface form (Corpus.Display:
//     "vehicle", not "vehicl"; ties broken by byte order).
//  7. Phrases: adjacent content terms, with no punctuation break and nothing removed between
//     them, whose Dunning log-likelihood ratio passes a threshold become one term
//     ("traffic_stop"; package phrase). Merging is greedy from the left.
//  8. Vocabulary pruning (minimum document count, maximum document share, maximum size;
//     package weight), a CSR count matrix (package sparse) and TF-IDF (Corpus.Weights).
//  9. Routine narratives (few content terms, only routine words, or groups of near
//     duplicates found with MinHash; package routine) are flagged in Corpus.Routine, never
//     dropped.
//
// # Settings and the frozen pipeline
//
// One Settings value holds every choice (JSON-serialisable; save it with every model).
// Build returns, beside the Corpus, a Frozen pipeline: the settings plus the fixed
// vocabulary, phrases, repair and join tables and display forms. Frozen.Transform applies
// exactly the same processing to one new narrative at a time and returns its vocabulary ids
// and, for highlighting, the original byte span of each (Span). On the training narratives
// Transform reproduces Build's rows exactly (tested).
//
// Corpus does not keep per-narrative tokens (they would not fit for a million narratives):
// call Frozen.Transform (or Frozen.Segments for highlighting) on the narratives a report
// shows.
//
// # Determinism and speed
//
// Build runs its heavy steps on GOMAXPROCS goroutines over fixed blocks of narratives and
// merges the blocks in input order (or sums counts, which do not depend on order), so its
// output is byte-identical whatever GOMAXPROCS (tested). The tokenizer works on bytes with an
// ASCII fast path, and every per-word step (stemming, abbreviations, stopwords, repair) runs
// once per distinct word, not once per token. BenchmarkPipeline reports MB/s of raw text,
// MB per CPU-second and the size of vocabulary plus matrix.
//
// # Cautions
//
// Repairs, phrases and routine flags are heuristics about what narrative writers wrote, not
// findings of fact. The repair audit (WriteAudit) and the routine reasons are there so that
// reviewers can check them; on typed (not scanned) exports consider switching repair off,
// since a rare real word one OCR confusion away from a frequent one ("clock", "dock") is
// "corrected" too.
package text
