package main

import (
	"context"
	"encoding/json"
	"flag"

	"undercurrent/text/intake"
)

func init() {
	register(&command{
		name:  "survey",
		usage: "survey [options] file...",
		short: "describe an export before any modelling: columns, accounting, dates, lengths, duplicates",
		long: `Survey reads the export(s) the way every other command does and describes them
without modelling: the encoding and format of each file, the columns chosen for id, date and
narrative (and why), rows kept and rejected by reason, the date span with a count for every
month (empty months shown), the narrative length distribution, the share of exact-duplicate
narratives, the most common opening words, and words found in so many narratives that they
are candidates for the stopword list.

The description goes to standard output; the column choices and the accounting summary go
to standard error. With -rejects, the rejected rows are written as CSV (file, line, id,
reason, detail).

Example:

	undercurrent survey incidents_2021.csv incidents_2022.csv
	undercurrent survey -text narrative,supplement -date occurred -json export.xlsx`,
		setup: func(fs *flag.FlagSet) func(context.Context, *env, []string) error {
			var in inputFlags
			in.register(fs)
			rejects := fs.String("rejects", "", "write the rejected rows to this CSV file")
			asJSON := fs.Bool("json", false, "print the description as JSON")
			common := fs.Float64("common-share", 0, "list words found in more than this share of narratives (default 0.5)")
			return func(ctx context.Context, e *env, args []string) error {
				set, err := readInputs(ctx, e, &in, args)
				if err != nil {
					return err
				}
				if *rejects != "" {
					if err := writeRejects(*rejects, set); err != nil {
						return err
					}
				}
				res := intake.Survey(set, intake.SurveyOptions{CommonShare: *common})
				if *asJSON {
					enc := json.NewEncoder(e.stdout)
					enc.SetIndent("", "  ")
					return enc.Encode(res)
				}
				return res.WriteText(e.stdout)
			}
		},
	})
}
