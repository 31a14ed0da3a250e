package report

import (
	"cmp"
	"slices"
)

// Data is everything the report shows. The caller (cmd/) fills it from the reader, the
// models, the trend tables and the redactor; this package only lays it out.
//
// Every string in Data is plain text. It is escaped when written into the page, so
// markup in it shows as markup and never runs: do not pre-escape and never pass HTML.
// Counts that may have been withheld by small-cell suppression are strings (for example
// "<10"); the report prints them as given.
type Data struct {
	// Title heads the page and names the browser tab. Empty means "Narrative themes".
	Title string
	// Subtitle is one optional line under the title, e.g. the source and the period.
	Subtitle string
	// Generated is an optional plain-text stamp such as "2026-12-01". It is left to the
	// caller so that the same input gives a byte-identical page.
	Generated string

	Overview Overview
	// Themes in the order they are shown (usually by size, largest first).
	Themes []Theme
	// Hidden lists themes a reviewer hid with the labels file; filled by Apply.
	Hidden []HiddenTheme
	Tree   Tree
	// Mixture is the narrative-by-theme heatmap; Copies the groups of narratives that
	// repeat one text. Both are filled after Apply (they use the curated theme numbers);
	// rows of themes not in Themes are left out when the page is drawn.
	Mixture Mixture
	Copies  Copies
	KChoice KChoice
	Methods Methods
	// Cautions are added after the built-in cautions (see BuiltinCautions), which are
	// always shown.
	Cautions    []string
	DataQuality DataQuality
	// Redaction counts what the redactor replaced, one row per kind, sorted by Kind
	// (see RedactionCountsFrom).
	Redaction []RedactionCount
	// Curation describes the labels file applied, if any; filled by Apply.
	Curation CurationNote
}

// Overview accounts for every row read.
type Overview struct {
	// Read is the number of rows read from the input.
	Read int
	// Kept is the number of narratives the models were fitted on.
	Kept int
	// Rejected gives the rows not kept, one entry per reason. Read should equal Kept plus
	// Routine plus the sum of Rejected; the report says so when it does not.
	Rejected []Reason
	// First and Last are the first and last dates of the kept narratives (YYYY-MM-DD).
	First, Last string
	// Routine is the number of routine narratives (boilerplate, e.g. "alarm reset, no
	// further action") set aside before fitting, and RoutineNote says how they were found.
	Routine     int
	RoutineNote string
}

// Reason is one reason a row was not kept and how many rows it applied to.
type Reason struct {
	Reason string
	Count  int
}

// Theme is one theme of the model, after curation.
type Theme struct {
	// ID is the theme's number in the model (0-based); it stays the same after
	// relabelling, and a merged theme keeps the ID of the theme it was merged into.
	ID int
	// Label is the name shown. When LabelByPerson is false it was made by the program
	// (usually from the top words) and the report says so.
	Label         string
	LabelByPerson bool
	// Description is an optional longer explanation, and Note an optional reviewer's note.
	Description string
	Note        string
	// TopWords are the most probable words of the theme, RelevantWords the words ranked
	// by relevance (probability weighed against overall frequency), and
	// DistinctiveWords the words that set it apart from the other themes. Highest first.
	TopWords         []string
	RelevantWords    []string
	DistinctiveWords []string
	Size             Size
	// TrendNote says in plain words what the long-run trend test found, e.g. "No clear
	// rise or fall over the period (Mann–Kendall, p = 0.41)". Optional.
	TrendNote string
	// Months is the monthly series, one point per calendar month in order, gaps included.
	Months []MonthPoint
	// GroupColumn names the column Groups compares (e.g. "District").
	GroupColumn string
	Groups      []GroupShare
	// Examples are 3–5 redacted narratives where the theme is strong.
	Examples []Example
	// Copies is the number of the theme's narratives (those with it as the strongest
	// theme) that sit in a group of narratives repeating one text (see Data.Copies), as
	// published; empty when no search was made. CopiesShare is that number over
	// Size.Dominant's, not shown when CopiesWithheld.
	Copies         string
	CopiesShare    float64
	CopiesWithheld bool
	// MergedFrom lists the IDs of themes merged into this one by the labels file.
	MergedFrom []int
	// SeriesNote explains, when set, why Months or Groups are missing (e.g. after a merge
	// whose series was not recomputed).
	SeriesNote string
}

// Size is how big a theme is.
type Size struct {
	// Dominant is the number of narratives whose strongest theme this is, as published
	// (it may be withheld, e.g. "<10").
	Dominant string
	// Expected is the sum over narratives of the theme's share: the number of
	// narratives' worth of text the theme accounts for.
	Expected float64
	// Share is Expected divided by the number of kept narratives, in [0, 1].
	Share float64
}

// MonthPoint is one calendar month of a theme's series.
type MonthPoint struct {
	// Month is "YYYY-MM".
	Month string
	// Count is the number of narratives that month whose strongest theme this is, as
	// published ("<10" when withheld, "" in a gap).
	Count string
	// Share of the month's narratives with this theme as the strongest, and its 95%
	// Wilson score interval [Low, High]. Not shown when Withheld or Gap is set.
	Share, Low, High float64
	// Withheld is set when suppression withheld this month's share.
	Withheld bool
	// Gap is set when there were no narratives at all that month.
	Gap bool
	// Partial is set when the month is only partly covered by the data (first or last).
	Partial bool
	// Flag is a short plain label for a month that stands out (e.g. "high"); empty when
	// not flagged. FlagText explains it in plain words; it is never a finding.
	Flag     string
	FlagText string
}

// GroupShare is the theme's share within one group (e.g. one district).
type GroupShare struct {
	Group string
	// Count as published (may be "<10").
	Count string
	// Share of the group's narratives with this theme as the strongest, and its 95%
	// Wilson score interval.
	Share, Low, High float64
	// Withheld is set when suppression withheld this cell.
	Withheld bool
	// StandsOut is empty, or plain words such as "more than the other groups" when the
	// adjusted standardised residual of the cell is large.
	StandsOut string
	// Higher gives the direction of a cell that stands out: above the other groups (true) or
	// below them (false). The panel marks it ▲ or ▼.
	Higher bool
}

// Example is one redacted narrative.
type Example struct {
	// ID is the narrative's identifier as published (it may be a redacted row number).
	ID string
	// Date is YYYY-MM-DD, or "" when unknown.
	Date string
	// Share is the theme's share in this narrative, in [0, 1].
	Share float64
	// Segments is the redacted text cut into pieces; Hit pieces are the theme's words and
	// are highlighted. Joining the Text of all segments gives the whole narrative.
	Segments []Segment
}

// Segment is a piece of narrative text.
type Segment struct {
	Text string
	Hit  bool
}

// HiddenTheme is a theme removed from view by the labels file.
type HiddenTheme struct {
	ID    int
	Label string
	// Line is the labels-file position of the "hide" line, e.g. "labels.txt:12".
	Line string
	// Size is the theme's size when it was hidden: its narratives still count in every
	// total, so the page says how much of them the hidden theme holds.
	Size Size
}

// Tree is the hierarchical clustering of the themes.
type Tree struct {
	// Method says how the tree was made, e.g. "Ward's method on Hellinger distances
	// between the themes' word distributions".
	Method string
	// Leaves are the themes, in model order; a merge refers to leaf i by index i.
	Leaves []TreeLeaf
	// Merges follows the SciPy linkage convention: merge j joins clusters Left and
	// Right, where an index below len(Leaves) is a leaf and index len(Leaves)+i is the
	// cluster formed by merge i. Heights must not decrease.
	Merges []TreeMerge
	// Suggestions are pairs of themes close enough that a reviewer may want to merge
	// them.
	Suggestions []MergeSuggestion
}

// TreeLeaf is one theme as a leaf of the tree.
type TreeLeaf struct {
	Theme int
	Label string
}

// TreeMerge is one step of the clustering.
type TreeMerge struct {
	Left, Right int
	Height      float64
}

// MergeSuggestion names two themes that might be one.
type MergeSuggestion struct {
	A, B   int
	Height float64
	// Why is a plain-words reason, e.g. "share 6 of their 10 top words".
	Why string
}

// Mixture is a heatmap of how narratives mix the themes: one column per narrative, or per
// group of narratives with similar theme shares when there are many, in an order that puts
// similar columns side by side; one row per theme.
type Mixture struct {
	// Method says in plain words how the columns were made and ordered.
	Method string
	// Themes are the theme IDs of the rows, in the order shown.
	Themes []int
	// Columns in the order shown.
	Columns []MixColumn
}

// MixColumn is one column of the mixture heatmap.
type MixColumn struct {
	// Label names the column, e.g. "group 12" or a narrative reference.
	Label string
	// Count is the number of narratives in the column, as published (may be "<10").
	Count string
	// Shares are the mean share of each theme of Mixture.Themes (same order) over the
	// column's narratives, in [0, 1].
	Shares []float64
}

// Copies describes the groups of narratives whose words are nearly the same: one text
// pasted into report after report, with a few details changed.
type Copies struct {
	// Ran is set when the search was made; otherwise Note says why not.
	Ran bool
	// Method says in plain words how the groups were found and what may be missed.
	Method string
	// Checked is the number of narratives compared, Short the number left out as too
	// short to tell a copy from a coincidence.
	Checked, Short int
	// Groups is the number of groups found; InGroups the number of narratives in them,
	// as published.
	Groups   int
	InGroups string
	// Listed are the groups shown, largest first (groups smaller than the publication
	// threshold are counted but not listed).
	Listed []CopyGroup
	// Note says what was left out, in plain words.
	Note string
}

// CopyGroup is one group of narratives that repeat one text.
type CopyGroup struct {
	// Number is the group's number, 1 for the largest, as in the export.
	Number int
	// Size is the number of narratives in the group, as published.
	Size string
	// LeastSimilarity is the smallest cosine similarity of the words of two of its
	// narratives, in [0, 1].
	LeastSimilarity float64
	// Themes are the strongest themes of its narratives, most frequent first.
	Themes []CopyTheme
	// First and Last are the months (YYYY-MM) of its first and last dated narrative.
	First, Last string
	// Example is one of its narratives, redacted; Hit segments are the words that not
	// every narrative of the group has: the details that change from copy to copy.
	Example Example
}

// CopyTheme is one theme of a group of copies and how many of the group's narratives have
// it as their strongest theme, as published.
type CopyTheme struct {
	Theme int
	Label string
	Count string
}

// KChoice records how the number of themes was chosen.
type KChoice struct {
	// Note explains the choice in plain words.
	Note string
	Rows []KRow
}

// KRow holds the measures for one candidate number of themes. Higher is better for all.
type KRow struct {
	K int
	// HeldOutLL is the held-out log-likelihood per word.
	HeldOutLL float64
	// NPMI and UMass are topic coherence measures (Bouma 2009; Mimno et al. 2011).
	NPMI, UMass float64
	// Stability is the agreement of themes across refits with different seeds, in [0, 1].
	Stability   float64
	Recommended bool
}

// Methods records how the report was made, so that it can be reproduced.
type Methods struct {
	// Steps are the pipeline steps in order, in plain words.
	Steps []string
	// Settings are the parameters (key, value), in the order given.
	Settings []KV
	Seed     string
	// Versions of the program and of the libraries that shaped the numbers.
	Versions []KV
	// InputFingerprint identifies the input, e.g. "sha256:…" of the file read.
	InputFingerprint string
}

// KV is a key and its value.
type KV struct {
	Key, Value string
}

// DataQuality is the appendix about the input's quality.
type DataQuality struct {
	Notes  []string
	Tables []Table
}

// Table is a small plain-text table.
type Table struct {
	Title   string
	Columns []string
	Rows    [][]string
}

// RedactionCount is how many replacements of one kind the redactor made.
type RedactionCount struct {
	Kind  string
	Count int
}

// CurationNote says which labels file was applied to the report.
type CurationNote struct {
	// File is the labels file's name; empty when none was applied.
	File string
	// Statements is the number of statements applied.
	Statements int
}

// RedactionCountsFrom turns a map of counts by kind into a slice sorted by kind, so that
// the report does not depend on map order.
func RedactionCountsFrom(m map[string]int) []RedactionCount {
	out := make([]RedactionCount, 0, len(m))
	for k, v := range m {
		out = append(out, RedactionCount{Kind: k, Count: v})
	}
	slices.SortFunc(out, func(a, b RedactionCount) int { return cmp.Compare(a.Kind, b.Kind) })
	return out
}

// BuiltinCautions are shown in every report, before Data.Cautions.
func BuiltinCautions() []string {
	return []string{
		"The themes summarise what the writer of each narrative wrote. They are not findings of fact about what happened, and the words are the writers' own.",
		"Redaction is automatic and misses things: names, addresses and other details may remain in the examples. Read every example before sharing this file.",
		"Small counts can identify people. Counts below the suppression threshold are withheld, but combining this report with other sources may still point to someone.",
		"A month or group that stands out is a prompt to look closer, not evidence that something changed: recording practice, staffing and policy also move these numbers.",
		"Before publishing this report or any part of it, check with counsel, with local public-records law, with the terms under which the data were shared, and with an ethics review.",
	}
}
