package main

import (
	"context"
	"encoding/csv"
	"encoding/json"
	"flag"
	"fmt"
	"io"
	"math"
	"strconv"

	"undercurrent/topics"
)

func init() {
	register(&command{
		name:  "sweep",
		usage: "sweep [options] file...",
		short: "compare numbers of themes: held-out likelihood, coherence, stability, and a recommendation",
		long: `Sweep reads, redacts and cleans the export(s) as 'undercurrent fit' does and fits the
themes for every number of themes K in -k-range on the narratives not held out (-held-out,
a seeded split; routine ones are set aside as for fitting), with -seeds fits per K. For each
K it reports:

	heldout_ll   held-out log-likelihood per token of the held-out narratives by document
	             completion (Wallach, Murray, Salakhutdinov & Mimno 2009): higher is better
	npmi         mean NPMI coherence of each theme's top words (Bouma 2009), -1 to 1
	umass        mean UMass coherence (Mimno et al. 2011), 0 or below; nearer 0 is better
	stability    mean matched top-word Jaccard agreement between the seeds' fits
	             (Greene, O'Callaghan & Cunningham 2014), 0 to 1

and recommends one K, with the rule applied and the reasons in plain sentences. The table
goes to standard output (-json for JSON); -out-table also writes it as CSV.

The recommendation is a starting point for a person's choice, not a proof that the
collection holds that many subjects.

Example:

	undercurrent sweep -k-range 6-16/2 incidents.csv
	undercurrent sweep -k-range 8,10,12 -seeds 3 -json -out-table out/k-choice.csv incidents.csv`,
		setup: func(fs *flag.FlagSet) func(context.Context, *env, []string) error {
			var (
				in      inputFlags
				tf      textFlags
				rf      redactFlags
				mf      modelFlags
				seeds   int
				heldOut float64
				asJSON  bool
				table   string
			)
			in.register(fs)
			tf.register(fs)
			rf.register(fs)
			fs.StringVar(&mf.krange, "k-range", "6,8,10,12,14,16", "numbers of themes to compare: a list (6,8,10) or a range with step (6-16/2)")
			fs.Uint64Var(&mf.seed, "seed", 1, "random seed of the split and of the first fit per K (the others use seed+1, ...)")
			fs.IntVar(&mf.iterations, "iterations", 0, "Gibbs sweeps per fit (default 200)")
			fs.StringVar(&mf.seedsFile, "seed-words", "", "file naming guided themes by seed words, used in every fit (see 'undercurrent help fit')")
			fs.IntVar(&seeds, "seeds", 2, "fits per K with different seeds; their agreement is the stability figure")
			fs.Float64Var(&heldOut, "held-out", 0.2, "share of narratives held out for the likelihood")
			fs.BoolVar(&asJSON, "json", false, "print the table as JSON")
			fs.StringVar(&table, "out-table", "", "also write the table to this CSV file")
			return func(ctx context.Context, e *env, args []string) error {
				ks, err := parseKRange(mf.krange)
				if err != nil {
					return err
				}
				if seeds < 1 {
					return usagef("-seeds %d: want at least 1", seeds)
				}
				if !(heldOut > 0 && heldOut < 1) {
					return usagef("-held-out %v: want a share between 0 and 1", heldOut)
				}
				if mf.iterations < 0 {
					return usagef("-iterations %d: want at least 1", mf.iterations)
				}
				p, err := prepare(ctx, e, &in, &tf, &rf, "", args)
				if err != nil {
					return err
				}
				fset, err := mf.fitSettings(e, p)
				if err != nil {
					return err
				}
				c, err := p.topicsCorpus()
				if err != nil {
					return err
				}
				fset.Chains = 1
				if fset.Iterations == 0 {
					fset.Iterations = 200
				}
				prog := newProgress(e, "comparing numbers of themes", 0)
				tab, err := topics.Sweep(ctx, c, topics.SweepSettings{Ks: ks, Fit: fset, Seeds: seeds, HeldOut: heldOut})
				prog.done()
				if err != nil {
					return err
				}
				if table != "" {
					if err := writeFileAtomic(table, func(w io.Writer) error { return writeSweepCSV(w, tab) }); err != nil {
						return err
					}
					fmt.Fprintf(e.stderr, "wrote %s\n", table)
				}
				if asJSON {
					enc := json.NewEncoder(e.stdout)
					enc.SetIndent("", "  ")
					return enc.Encode(sweepJSONOf(tab))
				}
				return writeSweepText(e.stdout, tab)
			}
		},
	})
}

// sweepJSON is the sweep table as printed by -json. Stability is null with one seed.
type sweepJSON struct {
	Rows        []sweepRowJSON `json:"rows"`
	Recommended int            `json:"recommended"`
	Reasons     []string       `json:"reasons"`
	Rule        string         `json:"rule"`
	TrainDocs   int            `json:"train_narratives"`
	HeldOutDocs int            `json:"held_out_narratives"`
	Seeds       int            `json:"seeds"`
	Seed        uint64         `json:"seed"`
	Iterations  int            `json:"iterations"`
}

type sweepRowJSON struct {
	K           int       `json:"k"`
	HeldOutLL   float64   `json:"heldout_ll_per_token"`
	NPMI        float64   `json:"npmi"`
	UMass       float64   `json:"umass"`
	Stability   *float64  `json:"stability"`
	ThemeNPMI   []float64 `json:"theme_npmi"`
	ThemeUMass  []float64 `json:"theme_umass"`
	Recommended bool      `json:"recommended"`
}

func sweepJSONOf(t *topics.SweepTable) sweepJSON {
	out := sweepJSON{Recommended: t.Recommended, Reasons: t.Reasons, Rule: t.Rule,
		TrainDocs: t.TrainDocs, HeldOutDocs: t.HeldOutDocs, Seeds: t.Settings.Seeds,
		Seed: t.Settings.Fit.Seed, Iterations: t.Settings.Fit.Iterations}
	for _, r := range t.Rows {
		row := sweepRowJSON{K: r.K, HeldOutLL: r.HeldOutLL, NPMI: r.NPMI, UMass: r.UMass,
			ThemeNPMI: r.ThemeNPMI, ThemeUMass: r.ThemeUMass, Recommended: r.K == t.Recommended}
		if !math.IsNaN(r.Stability) {
			s := r.Stability
			row.Stability = &s
		}
		out.Rows = append(out.Rows, row)
	}
	return out
}

func writeSweepText(w io.Writer, t *topics.SweepTable) error {
	fmt.Fprintf(w, "%d narratives to fit on, %d held out\n\n", t.TrainDocs, t.HeldOutDocs)
	fmt.Fprintf(w, "%4s  %12s  %7s  %7s  %9s\n", "K", "heldout_ll", "npmi", "umass", "stability")
	for _, r := range t.Rows {
		mark := ""
		if r.K == t.Recommended {
			mark = "  <- recommended"
		}
		fmt.Fprintf(w, "%4d  %12.4f  %7.4f  %7.3f  %9s%s\n", r.K, r.HeldOutLL, r.NPMI, r.UMass, fmtStability(r.Stability), mark)
	}
	fmt.Fprintf(w, "\nRecommended number of themes: %d\n", t.Recommended)
	for _, r := range t.Reasons {
		fmt.Fprintf(w, "  - %s\n", r)
	}
	_, err := fmt.Fprintf(w, "Rule: %s\n", t.Rule)
	return err
}

func fmtStability(x float64) string {
	if math.IsNaN(x) {
		return "n/a"
	}
	return strconv.FormatFloat(x, 'f', 3, 64)
}

func writeSweepCSV(w io.Writer, t *topics.SweepTable) error {
	cw := csv.NewWriter(w)
	cw.Write([]string{"k", "heldout_ll_per_token", "npmi", "umass", "stability", "recommended"})
	f := func(x float64) string {
		if math.IsNaN(x) {
			return ""
		}
		return strconv.FormatFloat(x, 'g', -1, 64)
	}
	for _, r := range t.Rows {
		cw.Write([]string{strconv.Itoa(r.K), f(r.HeldOutLL), f(r.NPMI), f(r.UMass), f(r.Stability), strconv.FormatBool(r.K == t.Recommended)})
	}
	cw.Flush()
	return cw.Error()
}
