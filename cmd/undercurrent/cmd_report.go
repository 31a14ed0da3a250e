package main

import (
	"context"
	"flag"
)

func init() {
	register(&command{
		name:  "report",
		usage: "report [options] file...",
		short: "the whole job: themes, trends and the community-review report with exports",
		long: `Report runs the whole job on the export(s): reads and accounts for every row, redacts
personal information, cleans and weighs the text, chooses the number of themes (unless
-themes is given), fits the themes, follows them month by month and across the first -group
column, and writes into -out:

	report.html            the offline community-review report (one file, no network)
	narratives-wide.csv    one row per narrative: id, date, groups, strongest themes
	narratives-long.csv    one row per narrative and theme with a share of at least 0.01
	themes.csv             themes: label, top words, size
	monthly.csv/.json      monthly series per theme with 95% Wilson intervals and flags
	flags.csv/.json        months that stand out, explained in plain words
	trends.csv/.json       long-run trend tests per theme
	groups-<col>.csv/.json theme shares per group, and the chi-square test (-test)
	words-<col>.csv/.json  words that set each group apart from the rest (weighted log-odds)
	repeated-text.csv/.json
	                       narratives that repeat one text (templated narratives): one
	                       row per narrative of each group of at least -min-count
	repairs.csv            every OCR repair the text pipeline made
	rejects.csv            every input row not kept, with its line and reason
	themes.ucmodel         the model file, for 'undercurrent tag' and 'describe'

The report also lists groups of narratives that repeat one text, pasted by a writer
into report after report with a few details changed (every two narratives of a group have
a cosine similarity of their TF-IDF words of at least -repeat-similarity, 0.7 by default;
0 switches the search off): such a group is counted many times in its theme, and says
what its writer wrote, not what happened.

Everything written is redacted, and counts below -min-count are withheld together with
whatever would let them be recovered. Raw text and unsuppressed tables go only to files
whose names contain "private", and only with -private-review or -publish-small-counts.

A labels file (-labels) names, describes, merges and hides themes without refitting:

	# lines are: theme N: label = TEXT | theme N: description = TEXT |
	#            theme N: note = TEXT   | merge N into M | hide N
	theme 3: label = Parking complaints
	merge 7 into 3

Example:

	undercurrent report -out out/city -group district,call_type incidents.csv
	undercurrent report -themes 12 -labels labels.txt -out out/city incidents.csv`,
		setup: func(fs *flag.FlagSet) func(context.Context, *env, []string) error {
			var f jobFlags
			f.register(fs, true)
			return func(ctx context.Context, e *env, args []string) error {
				res, err := runJob(ctx, e, &f, args)
				return jobDone(e, &f, res, err)
			}
		},
	})
}
