package topics

import (
	"context"
	"encoding/json"
	"fmt"
	"math"
	"math/rand/v2"
	"strconv"

	"undercurrent/text/sparse"
)

// DocumentCompletion returns the held-out log-likelihood per token of docs under the
// tagger's model by document completion (Wallach, Murray, Salakhutdinov & Mimno 2009,
// "Evaluation methods for topic models", §4, with θ point-estimated): for each document θ is
// folded in from the first ⌊N/2⌋ tokens (Tagger.Infer, id = the document's position) and the
// remaining tokens are scored,
//
//	Σ_docs Σ_{i > N/2} log Σ_k θ_k φ_k,w_i  /  number of scored tokens
//
// Token order matters: pass tokens in text order or a random order, not sorted by id.
func DocumentCompletion(tg *Tagger, docs [][]int32) (llPerToken float64, scored int) {
	m := tg.m
	ll := 0.0
	theta := make([]float64, m.k)
	for i, d := range docs {
		h := len(d) / 2
		if h == 0 || h == len(d) {
			continue
		}
		tg.InferTo(theta, strconv.Itoa(i), d[:h])
		for _, w := range d[h:] {
			p := 0.0
			for k, t := range theta {
				p += t * tg.phiT[int(w)*m.k+k]
			}
			ll += math.Log(p)
			scored++
		}
	}
	if scored == 0 {
		return math.NaN(), 0
	}
	return ll / float64(scored), scored
}

// SweepSettings controls Sweep. Every zero value selects a documented default.
type SweepSettings struct {
	// Ks lists the numbers of themes to compare (at least one, each ≥ 1).
	Ks []int
	// Fit is used for every fit; its K is replaced, its Seed is the first seed.
	Fit Settings
	// HeldOut is the fraction of narratives held out for document completion (chosen by a
	// permutation seeded from Fit.Seed). Zero means 0.2.
	HeldOut float64
	// Seeds is the number of fits per K, with seeds Fit.Seed, Fit.Seed+1, ...; their
	// agreement is the stability figure. Zero means 2.
	Seeds int
	// TopN is the number of top words per theme for coherence and stability. Zero means 10.
	TopN int
	// Tolerance is how far (nats per token) below the best held-out log-likelihood a K may
	// be and still be recommended. Zero means 0.02.
	Tolerance float64
	// MinStability is the stability a K needs to be preferred. Zero means 0.6.
	MinStability float64
	// Infer controls fold-in for document completion.
	Infer InferSettings
}

// SweepRow is one K of a sweep. Figures are means over the seeds' fits.
type SweepRow struct {
	K int
	// HeldOutLL is the held-out document-completion log-likelihood per token.
	HeldOutLL float64
	// NPMI and UMass are the mean coherence over themes of each theme's top words, computed
	// on all narratives (the reference corpus).
	NPMI, UMass float64
	// ThemeNPMI and ThemeUMass are the first seed's per-theme coherences.
	ThemeNPMI, ThemeUMass []float64
	// Stability is the mean matched top-word Jaccard over all pairs of seeds (Greene,
	// O'Callaghan & Cunningham 2014); NaN with one seed.
	Stability float64
}

// MarshalJSON encodes the row with NaN figures (stability with one seed, a held-out
// log-likelihood with nothing to score) as null, which encoding/json cannot do by itself.
func (r SweepRow) MarshalJSON() ([]byte, error) {
	num := func(x float64) *float64 {
		if math.IsNaN(x) || math.IsInf(x, 0) {
			return nil
		}
		return &x
	}
	nums := func(xs []float64) []*float64 {
		out := make([]*float64, len(xs))
		for i, x := range xs {
			out[i] = num(x)
		}
		return out
	}
	return json.Marshal(struct {
		K                     int
		HeldOutLL, NPMI       *float64
		UMass                 *float64
		ThemeNPMI, ThemeUMass []*float64
		Stability             *float64
	}{r.K, num(r.HeldOutLL), num(r.NPMI), num(r.UMass), nums(r.ThemeNPMI), nums(r.ThemeUMass), num(r.Stability)})
}

// SweepTable is the result of Sweep, kept for the report's methods section.
type SweepTable struct {
	Rows        []SweepRow
	Recommended int      // recommended K
	Reasons     []string // why, in plain sentences
	Rule        string   // the rule applied, in words
	TrainDocs   int
	HeldOutDocs int
	Settings    SweepSettings
}

// RecommendRule describes how Sweep recommends K.
const RecommendRule = "Among the K whose held-out log-likelihood per token is within the tolerance of the best, " +
	"keep those whose stability across seeds reaches the minimum (all of them if none does); " +
	"recommend the one with the highest mean NPMI, the smaller K on a tie."

// Sweep fits models for each K in s.Ks on a training split of c and reports, per K, the
// held-out document-completion log-likelihood, NPMI and UMass coherence and stability across
// seeds, and a recommended K by RecommendRule. Seed themes in s.Fit are used in every fit.
func Sweep(ctx context.Context, c Corpus, s SweepSettings) (*SweepTable, error) {
	if c.Counts == nil {
		panic("topics: nil count matrix")
	}
	if len(s.Ks) == 0 {
		return nil, fmt.Errorf("topics: sweep needs at least one K")
	}
	if s.HeldOut == 0 {
		s.HeldOut = 0.2
	}
	if s.Seeds == 0 {
		s.Seeds = 2
	}
	if s.TopN == 0 {
		s.TopN = 10
	}
	if s.Tolerance == 0 {
		s.Tolerance = 0.02
	}
	if s.MinStability == 0 {
		s.MinStability = 0.6
	}
	if !(s.HeldOut > 0 && s.HeldOut < 1) || s.Seeds < 1 || s.TopN < 2 {
		return nil, fmt.Errorf("topics: sweep settings out of range (HeldOut %g, Seeds %d, TopN %d)", s.HeldOut, s.Seeds, s.TopN)
	}
	m := c.Counts
	words, docStart, err := tokens(m)
	if err != nil {
		return nil, err
	}
	D := m.Rows
	rng := rand.New(rand.NewPCG(s.Fit.Seed, 0x5eed))
	perm := rng.Perm(D)
	nTest := int(math.Round(s.HeldOut * float64(D)))
	if nTest < 1 || nTest >= D {
		return nil, fmt.Errorf("topics: %d narratives are too few to hold out %g of them", D, s.HeldOut)
	}
	isTest := make([]bool, D)
	for _, d := range perm[:nTest] {
		isTest[d] = true
	}
	b := sparse.NewBuilder(m.Cols)
	var test [][]int32
	for d := 0; d < D; d++ {
		if !isTest[d] {
			cols, vals := m.Row(d)
			b.AddRow(cols, vals)
			continue
		}
		doc := append([]int32(nil), words[docStart[d]:docStart[d+1]]...)
		r := rand.New(rand.NewPCG(s.Fit.Seed, uint64(d)))
		r.Shuffle(len(doc), func(i, j int) { doc[i], doc[j] = doc[j], doc[i] })
		test = append(test, doc)
	}
	train := Corpus{Counts: b.Matrix(), Vocabulary: c.Vocabulary, Display: c.Display, Pipeline: c.Pipeline}
	ref := NewCoherenceIndex(m)
	table := &SweepTable{TrainDocs: D - nTest, HeldOutDocs: nTest, Settings: s, Rule: RecommendRule}
	progress := s.Fit.Progress
	totalFits := len(s.Ks) * s.Seeds
	fitNo := 0
	for _, K := range s.Ks {
		row := SweepRow{K: K, Stability: math.NaN()}
		var tops [][][]int
		for j := 0; j < s.Seeds; j++ {
			fs := s.Fit
			fs.K = K
			fs.Seed = s.Fit.Seed + uint64(j)
			if progress != nil {
				base := fitNo
				fs.Progress = func(done, total int) { progress(base*total+done, totalFits*total) }
			}
			model, err := Fit(ctx, train, fs)
			if err != nil {
				return nil, fmt.Errorf("topics: sweep K = %d, seed %d: %w", K, fs.Seed, err)
			}
			fitNo++
			ll, _ := DocumentCompletion(NewTagger(model, s.Infer), test)
			row.HeldOutLL += ll / float64(s.Seeds)
			top := model.TopIDs(s.TopN)
			tops = append(tops, top)
			np, um := 0.0, 0.0
			for k, t := range top {
				a, u := ref.NPMI(t), ref.UMass(t)
				np += a
				um += u
				if j == 0 {
					row.ThemeNPMI = append(row.ThemeNPMI, a)
					row.ThemeUMass = append(row.ThemeUMass, u)
				}
				_ = k
			}
			row.NPMI += np / float64(K) / float64(s.Seeds)
			row.UMass += um / float64(K) / float64(s.Seeds)
		}
		if s.Seeds > 1 {
			sum, n := 0.0, 0
			for i := range tops {
				for j := i + 1; j < len(tops); j++ {
					sum += MatchedJaccard(tops[i], tops[j])
					n++
				}
			}
			row.Stability = sum / float64(n)
		}
		table.Rows = append(table.Rows, row)
	}
	table.Recommended, table.Reasons = recommend(table.Rows, s.Tolerance, s.MinStability)
	return table, nil
}

func recommend(rows []SweepRow, tol, minStab float64) (int, []string) {
	best := math.Inf(-1)
	bestK := 0
	for _, r := range rows {
		if r.HeldOutLL > best {
			best, bestK = r.HeldOutLL, r.K
		}
	}
	var reasons []string
	reasons = append(reasons, fmt.Sprintf("The best held-out log-likelihood is %.4f nats per token, at K = %d.", best, bestK))
	var near []SweepRow
	for _, r := range rows {
		if r.HeldOutLL >= best-tol {
			near = append(near, r)
		}
	}
	ks := ""
	for i, r := range near {
		if i > 0 {
			ks += ", "
		}
		ks += strconv.Itoa(r.K)
	}
	reasons = append(reasons, fmt.Sprintf("Within %.3g nats of it: K = %s.", tol, ks))
	var stable []SweepRow
	for _, r := range near {
		if r.Stability >= minStab {
			stable = append(stable, r)
		}
	}
	if len(stable) == 0 {
		reasons = append(reasons, fmt.Sprintf("None of them reaches stability %.2g across seeds (or only one seed was fitted), so all are kept.", minStab))
		stable = near
	} else if len(stable) < len(near) {
		reasons = append(reasons, fmt.Sprintf("%d of them reach stability %.2g across seeds.", len(stable), minStab))
	}
	pick := stable[0]
	for _, r := range stable[1:] {
		if r.NPMI > pick.NPMI || r.NPMI == pick.NPMI && r.K < pick.K {
			pick = r
		}
	}
	reasons = append(reasons, fmt.Sprintf("K = %d has the highest mean NPMI among them (%.3f; UMass %.3f; stability %.2f).",
		pick.K, pick.NPMI, pick.UMass, pick.Stability))
	return pick.K, reasons
}
