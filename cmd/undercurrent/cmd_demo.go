package main

import (
	"context"
	_ "embed"
	"flag"
	"fmt"
	"io"
	"os"
	"path/filepath"

	"undercurrent/text/demotown"
)

// demoGuided is the demo's seed-word file: two concerns kept as tracked themes.
//
//go:embed demo_guided.txt
var demoGuided string

func init() {
	register(&command{
		name:  "demo",
		usage: "demo [options]",
		short: "generate the invented demo town's narratives and run the whole job on them",
		long: `Demo writes an invented town's incident narratives (about 6,000 over 36 months,
with planted themes, trends, abbreviations, OCR noise, HTML residue, invented personal
information, and copies of six saved texts with changed details, as writers paste them)
into <out>/private-input/incidents.csv, with the ground truth beside it in
<out>/private-input/truth.jsonl (both hold the raw, unredacted invented text, hence the
folder's name), and then runs the whole job ('undercurrent report') on it, with the
district and call_type columns as groups, and with two guided themes named by seed words
(<out>/guided-themes.txt: a mental-health crisis and use of force; -seed-words replaces
it). Everything in it is invented: the town, its streets, its people; phone numbers are
in the 555-0100..555-0199 range reserved for fiction.

It prints the path of the report on standard output.

Example:

	undercurrent demo -out out/demo
	undercurrent demo -out out/big -n 100000 -seed 7`,
		setup: func(fs *flag.FlagSet) func(context.Context, *env, []string) error {
			var f jobFlags
			f.register(fs, false)
			nDocs := fs.Int("n", 0, "number of narratives to generate (default 6000)")
			months := fs.Int("months", 0, "number of months to cover (default 36)")
			return func(ctx context.Context, e *env, args []string) error {
				if len(args) > 0 {
					return usagef("demo takes no file arguments")
				}
				if f.out == "out" {
					f.out = filepath.Join("out", "demo")
				}
				inDir := filepath.Join(f.out, "private-input")
				if err := os.MkdirAll(inDir, 0o755); err != nil {
					return err
				}
				if f.model.seedsFile == "" {
					// The demo tracks two concerns as guided themes (see demo_guided.txt).
					path := filepath.Join(f.out, "guided-themes.txt")
					if err := writeFileAtomic(path, func(w io.Writer) error {
						_, err := io.WriteString(w, demoGuided)
						return err
					}); err != nil {
						return err
					}
					f.model.seedsFile = path
				}
				cfg := demotown.Config{Seed: f.model.seed, N: *nDocs, Months: *months, TemplateRate: demotown.DemoTemplateRate}
				fmt.Fprintf(e.stderr, "generating the invented demo corpus into %s\n", inDir)
				if err := demotown.StreamDir(inDir, cfg); err != nil {
					return err
				}
				f.in.groups = "district,call_type"
				f.in.id = "incident_id"
				f.in.date = "reported"
				f.in.text = "narrative"
				f.in.now = "2026-01-01"
				if f.title == "" {
					f.title = "Demo: an invented town's incident narratives"
				}
				input := filepath.Join(inDir, "incidents.csv")
				res, err := runJob(ctx, e, &f, []string{input})
				if err == nil {
					err = demoReuse(ctx, e, &f, res, input)
				}
				return jobDone(e, &f, res, err)
			}
		},
	})
}

// demoReuse shows the model file at work, as a user would use it after the report: it
// describes the saved model and tags the input again with it ('undercurrent describe' and
// 'undercurrent tag'), writing model-description.txt and tagged.csv.
func demoReuse(ctx context.Context, e *env, f *jobFlags, res *jobResult, input string) error {
	model := filepath.Join(f.out, "themes.ucmodel")
	desc := filepath.Join(f.out, "model-description.txt")
	if err := writeFileAtomic(desc, func(w io.Writer) error {
		sub := &env{stdin: e.stdin, stdout: w, stderr: e.stderr, quiet: true}
		if code := run(ctx, sub, []string{"describe", "-model", model}); code != exitOK {
			return fmt.Errorf("describe exited %d", code)
		}
		return nil
	}); err != nil {
		return err
	}
	res.files = append(res.files, desc)
	tagged := filepath.Join(f.out, "tagged.csv")
	sub := &env{stdin: e.stdin, stdout: io.Discard, stderr: io.Discard, quiet: true}
	args := []string{"tag", "-q", "-model", model, "-out", tagged, "-id", f.in.id, "-date", f.in.date, "-text", f.in.text,
		"-group", f.in.groups, "-now", f.in.now, input}
	if code := run(ctx, sub, args); code != exitOK {
		if err := ctx.Err(); err != nil {
			return err
		}
		return fmt.Errorf("tag exited %d", code)
	}
	res.files = append(res.files, tagged)
	fmt.Fprintf(e.stderr, "described the model in %s and tagged the input again with it into %s\n", desc, tagged)
	return nil
}
