package main

import (
	"context"
	"flag"
	"fmt"
	"io"
	"strings"

	"undercurrent/topics"
)

func init() {
	register(&command{
		name:  "fit",
		usage: "fit [options] file...",
		short: "fit the themes and write the model file, for tag and describe",
		long: `Fit reads the export(s) the way the report does (every row accounted for), redacts
personal information, cleans and weighs the text, fits K themes (LDA by collapsed Gibbs
sampling) and writes the model file (-model). The model file holds the themes, the
vocabulary, the frozen text pipeline and a checksum; 'undercurrent tag' applies it to new
narratives and 'undercurrent describe' prints it.

The number of themes is -themes. Without -themes, -k-range must be given: the numbers of
themes it lists are compared first (as 'undercurrent sweep' does) and the recommended one
is fitted. Routine and near-duplicate narratives are set aside before fitting, as the
report does.

A short summary of each theme (number, label, most probable words) goes to standard output;
the accounting and progress go to standard error. With -rejects the rows not kept are
written as CSV.

Guided themes (-seed-words): a plain-text file names themes you want tracked across refits
by a few seed words each; they become themes 0, 1, ... in file order and keep their names
as labels. The format is our own:

	# lines starting with # and blank lines are ignored
	theme: mental health crisis
	words: mental, crisis, suicidal
	words: overdose            (more "words:" lines add to the theme above)
	theme: use of force
	words: taser, baton, force

Keys are case-insensitive; words are separated by commas. Words are read through the same
text processing as the narratives ("resisted" finds the term "resist"); a two-word phrase is
written as fit and describe print it ("animal control"). A word that matches no term of this
corpus's vocabulary is left out with a note naming it, so one seed file serves every refit;
a theme left with no word at all is an error. Every theme needs a name not used before.

Themes summarise what narrative writers wrote; they are not findings of fact.

Example:

	undercurrent fit -themes 12 -model out/themes.ucmodel incidents.csv
	undercurrent fit -k-range 8-16/2 -seed-words concerns.txt -model out/themes.ucmodel incidents.csv`,
		setup: func(fs *flag.FlagSet) func(context.Context, *env, []string) error {
			var (
				in  inputFlags
				tf  textFlags
				rf  redactFlags
				mf  modelFlags
				out string
				rej string
				top int
			)
			in.register(fs)
			tf.register(fs)
			rf.register(fs)
			mf.register(fs)
			fs.StringVar(&out, "model", "out/themes.ucmodel", "model file to write")
			fs.StringVar(&rej, "rejects", "", "write the rows not kept to this CSV file")
			fs.IntVar(&top, "top", 10, "top words per theme in the summary")
			return func(ctx context.Context, e *env, args []string) error {
				kRangeSet := false
				fs.Visit(func(f *flag.Flag) {
					if f.Name == "k-range" {
						kRangeSet = true
					}
				})
				if mf.themes < 0 {
					return usagef("-themes %d: want at least 1", mf.themes)
				}
				if mf.themes == 0 && !kRangeSet {
					return usagef("give -themes K, or -k-range to choose K by a sweep")
				}
				if top < 1 {
					return usagef("-top %d: want at least 1", top)
				}
				if _, err := parseKRange(mf.krange); err != nil && mf.themes == 0 {
					return err
				}
				p, err := prepare(ctx, e, &in, &tf, &rf, "", args)
				if err != nil {
					return err
				}
				if rej != "" {
					if err := writeRejects(rej, p.set); err != nil {
						return err
					}
				}
				k := mf.themes
				if k == 0 {
					var tab *topics.SweepTable
					k, tab, err = chooseK(ctx, e, p, &mf)
					if err != nil {
						return err
					}
					fmt.Fprintf(e.stderr, "number of themes: %d (%s)\n", k, strings.Join(tab.Reasons, " "))
				}
				m, err := fitModel(ctx, e, p, &mf, k)
				if err != nil {
					return err
				}
				if err := saveModel(out, m); err != nil {
					return err
				}
				if err := writeFitSummary(e.stdout, m, top); err != nil {
					return err
				}
				fmt.Fprintf(e.stderr, "wrote %s (%d themes, %d terms)\n", out, m.K(), m.V())
				return nil
			}
		},
	})
}

// writeFitSummary prints one line per theme: number, label and most probable words.
func writeFitSummary(w io.Writer, m *topics.Model, n int) error {
	fmt.Fprintf(w, "%d themes over %d terms; stability across chains %s\n", m.K(), m.V(), fmtFloat(m.Stability))
	for k := 0; k < m.K(); k++ {
		ws := m.TopWords(k, n, 1)
		parts := make([]string, len(ws))
		for i, x := range ws {
			parts[i] = strings.ReplaceAll(x.Display, "_", " ")
		}
		if _, err := fmt.Fprintf(w, "theme %2d  %s\n          %s\n", k, themeLabel(m, k), strings.Join(parts, ", ")); err != nil {
			return err
		}
	}
	return nil
}

// phraseSeeds writes the words of seed themes the way the vocabulary spells phrases: the
// text pipeline joins a phrase's words with "_" ("animal_control") and no term holds a
// space, while fit and describe print phrases with a space ("animal control").
func phraseSeeds(seeds []topics.SeedTheme) []topics.SeedTheme {
	for i := range seeds {
		for j, w := range seeds[i].Words {
			seeds[i].Words[j] = strings.Join(strings.Fields(w), "_")
		}
	}
	return seeds
}
