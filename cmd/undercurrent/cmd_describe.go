package main

import (
	"bufio"
	"context"
	"encoding/json"
	"flag"
	"fmt"
	"io"
	"math"
	"path/filepath"
	"strings"

	"undercurrent/topics"
)

func init() {
	register(&command{
		name:  "describe",
		usage: "describe [options]",
		short: "print a model file's themes, their words and the settings they were fitted with",
		long: `Describe loads a model file (-model, written by 'undercurrent fit' or 'report') after
checking its format version and checksum, and prints every theme: its number (as the report
and the exports use it), its label (the guided theme's name, or its three most probable
words), its most probable words and its most relevant words.

Relevance (Sievert & Shirley 2014) ranks a theme's words by

	λ log φ(word | theme) + (1 − λ) log(φ(word | theme) / p(word))

where p(word) is the word's share of all training tokens: λ = 1 is plain probability,
smaller λ favours words distinctive of the theme (-lambda, default 0.6 as Sievert & Shirley
recommend).

Then the model: its number of themes and terms, the priors α and β, the fingerprint of the
training counts (SHA-256), the settings it was fitted with, the model-file format version,
and the stability across chains (mean matched top-10-word Jaccard agreement).

Themes summarise what narrative writers wrote; they are not findings of fact.

Example:

	undercurrent describe -model out/city/themes.ucmodel
	undercurrent describe -model out/themes.ucmodel -top 20 -lambda 0.3 -json`,
		setup: func(fs *flag.FlagSet) func(context.Context, *env, []string) error {
			var (
				path   string
				n      int
				lambda float64
				asJSON bool
			)
			fs.StringVar(&path, "model", "out/themes.ucmodel", "model file to describe")
			fs.IntVar(&n, "top", 10, "words per theme in each list")
			fs.Float64Var(&lambda, "lambda", topics.DefaultLambda, "relevance weight λ, 0 to 1 (1 ranks by probability)")
			fs.BoolVar(&asJSON, "json", false, "print the description as JSON")
			return func(ctx context.Context, e *env, args []string) error {
				if len(args) > 0 {
					return usagef("describe takes no file arguments (use -model)")
				}
				if n < 1 {
					return usagef("-top %d: want at least 1", n)
				}
				if !(lambda >= 0 && lambda <= 1) {
					return usagef("-lambda %v: want 0 to 1", lambda)
				}
				m, _, err := loadModel(path)
				if err != nil {
					return err
				}
				d := describeModel(path, m, n, lambda)
				if asJSON {
					enc := json.NewEncoder(e.stdout)
					enc.SetIndent("", "  ")
					return enc.Encode(d)
				}
				return d.writeText(e.stdout)
			}
		},
	})
}

// fitView is the fit settings as describe shows them (JSON field names of the model file).
type fitView struct {
	K            int     `json:"k"`
	Iterations   int     `json:"iterations"`
	BurnIn       int     `json:"burn_in"`
	Samples      int     `json:"samples"`
	Alpha        float64 `json:"initial_alpha"`
	Beta         float64 `json:"initial_beta"`
	FixedPriors  bool    `json:"fixed_priors"`
	Seed         uint64  `json:"seed"`
	Partitions   int     `json:"partitions"`
	Chains       int     `json:"chains"`
	SeedStrength float64 `json:"seed_strength"`
}

type describedWord struct {
	Word      string  `json:"word"`
	Term      string  `json:"term"`
	Prob      float64 `json:"prob"`
	Relevance float64 `json:"relevance"`
}

type describedTheme struct {
	Theme     int             `json:"theme"`
	Label     string          `json:"label"`
	Guided    bool            `json:"guided"`
	Alpha     float64         `json:"alpha"`
	TopWords  []describedWord `json:"top_words"`
	Relevant  []describedWord `json:"relevant_words"`
	Lambda    float64         `json:"lambda"`
	ThemeName string          `json:"guided_name,omitempty"`
}

type description struct {
	File               string           `json:"file"`
	FormatVersion      int              `json:"format_version"`
	Program            string           `json:"program_version"`
	K                  int              `json:"k"`
	V                  int              `json:"v"`
	Beta               float64          `json:"beta"`
	AlphaSum           float64          `json:"alpha_sum"`
	Fingerprint        string           `json:"training_counts_sha256"`
	Stability          *float64         `json:"stability"`
	ChainLogLikelihood []float64        `json:"chain_log_likelihood"`
	Fit                fitView          `json:"fit"`
	Themes             []describedTheme `json:"themes"`
}

func describeModel(path string, m *topics.Model, n int, lambda float64) *description {
	fs := m.FitSettings()
	// Load accepts only the format this build writes, so a loaded model is of FormatVersion.
	d := &description{File: filepath.Base(path), FormatVersion: topics.FormatVersion, Program: version, K: m.K(), V: m.V(),
		Beta: m.Beta(), Fingerprint: m.InputFingerprint(), ChainLogLikelihood: m.ChainLogLikelihood,
		Fit: fitView{K: fs.K, Iterations: fs.Iterations, BurnIn: fs.BurnIn, Samples: fs.Samples, Alpha: fs.Alpha, Beta: fs.Beta,
			FixedPriors: fs.FixedPriors, Seed: fs.Seed, Partitions: fs.Partitions, Chains: fs.Chains, SeedStrength: fs.SeedStrength}}
	if !math.IsNaN(m.Stability) {
		s := m.Stability
		d.Stability = &s
	}
	alpha := m.Alpha()
	for _, a := range alpha {
		d.AlphaSum += a
	}
	words := func(ws []topics.Word) []describedWord {
		out := make([]describedWord, len(ws))
		for i, w := range ws {
			out[i] = describedWord{Word: strings.ReplaceAll(w.Display, "_", " "), Term: w.Term, Prob: w.Prob, Relevance: w.Relevance}
		}
		return out
	}
	for k := 0; k < m.K(); k++ {
		t := describedTheme{Theme: k, Label: themeLabel(m, k), Alpha: alpha[k], Lambda: lambda,
			TopWords: words(m.TopWords(k, n, 1)), Relevant: words(m.TopWords(k, n, lambda))}
		if name := m.ThemeName(k); name != "" {
			t.Guided, t.ThemeName = true, name
		}
		d.Themes = append(d.Themes, t)
	}
	return d
}

func joinWords(ws []describedWord) string {
	parts := make([]string, len(ws))
	for i, w := range ws {
		parts[i] = w.Word
	}
	return strings.Join(parts, ", ")
}

func (d *description) writeText(w io.Writer) error {
	bw := bufio.NewWriter(w)
	fmt.Fprintf(bw, "%s: %d themes over %d terms\n\n", d.File, d.K, d.V)
	for _, t := range d.Themes {
		kind := ""
		if t.Guided {
			kind = " (guided)"
		}
		fmt.Fprintf(bw, "theme %d%s: %s\n", t.Theme, kind, t.Label)
		fmt.Fprintf(bw, "  α %.4g\n", t.Alpha)
		fmt.Fprintf(bw, "  most probable: %s\n", joinWords(t.TopWords))
		fmt.Fprintf(bw, "  most relevant (λ = %g): %s\n\n", t.Lambda, joinWords(t.Relevant))
	}
	fmt.Fprintf(bw, "model\n")
	fmt.Fprintf(bw, "  model file format      %d (this program: %s, reads format %d)\n", d.FormatVersion, d.Program, topics.FormatVersion)
	fmt.Fprintf(bw, "  α (sum over themes)    %.4g\n", d.AlphaSum)
	fmt.Fprintf(bw, "  β                      %.4g\n", d.Beta)
	fmt.Fprintf(bw, "  training counts sha256 %s\n", d.Fingerprint)
	if d.Stability != nil {
		fmt.Fprintf(bw, "  stability              %.3f (mean matched top-10-word Jaccard of the other chains with the kept one)\n", *d.Stability)
	} else {
		fmt.Fprintf(bw, "  stability              n/a (one chain)\n")
	}
	if fr := d.Fit; fr.K > 0 {
		fmt.Fprintf(bw, "  fitted with            K %d, %d iterations (burn-in %d, %d samples averaged), seed %d, %d chains, %d partitions\n",
			fr.K, fr.Iterations, fr.BurnIn, fr.Samples, fr.Seed, fr.Chains, fr.Partitions)
		pri := "re-estimated (Minka's fixed point)"
		if fr.FixedPriors {
			pri = "fixed"
		}
		fmt.Fprintf(bw, "  priors                 initial α %.4g, initial β %.4g, %s; seed strength %g\n", fr.Alpha, fr.Beta, pri, fr.SeedStrength)
	}
	if len(d.ChainLogLikelihood) > 0 {
		parts := make([]string, len(d.ChainLogLikelihood))
		for i, x := range d.ChainLogLikelihood {
			parts[i] = fmt.Sprintf("%.6g", x)
		}
		fmt.Fprintf(bw, "  chain log p(w|z)       %s\n", strings.Join(parts, ", "))
	}
	return bw.Flush()
}
