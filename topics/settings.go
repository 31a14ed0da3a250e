package topics

import (
	"encoding/json"
	"fmt"

	"undercurrent/text/sparse"
)

// Corpus is the input to Fit: a document-term count matrix and the labels of its columns.
type Corpus struct {
	// Counts holds one row per narrative and one column per vocabulary term. Every stored
	// value must be a non-negative whole number.
	Counts *sparse.Matrix
	// Vocabulary holds the term of each column (len Counts.Cols). It may be nil, in which
	// case terms are named "w0", "w1", ... and seed themes cannot be used.
	Vocabulary []string
	// Display holds the form of each term shown to people (e.g. the most common unstemmed
	// spelling). Nil means Vocabulary is shown.
	Display []string
	// Pipeline is the text pipeline's settings, stored verbatim in the model file so that a
	// tagger can check it tokenizes new narratives the same way. It may be nil.
	Pipeline json.RawMessage
}

// Settings controls Fit. Every zero value selects a documented default.
type Settings struct {
	// K is the number of themes. It must be at least 1 (there is no default).
	K int
	// Iterations is the number of Gibbs sweeps over all tokens. Zero means 150 (on the
	// benchmark corpus 150 and 200 sweeps gave the same quality; see BenchmarkSynthetic).
	// Fewer sweeps lose quality there (seed 1; Hellinger to the true topics, held-out
	// LL/token, NMI): 150 sweeps 0.159, −7.533, 0.699; 120 with burn-in 95 0.166, −7.536,
	// 0.699; 100 with burn-in 75 0.173, −7.539, 0.686; 100 (burn-in 50) 0.185, −7.547,
	// 0.677; 75 0.255, −7.586, 0.640. Re-estimating the priors every 5 sweeps from sweep 10
	// (instead of every 10 from 24) was worse too: β overshoots to 0.30 (true 0.2) and
	// Hellinger is 0.178 at 150 sweeps, 0.206 at 100.
	Iterations int
	// BurnIn is the number of sweeps discarded before samples are averaged. Zero means
	// Iterations/2. Hyperparameters are re-estimated only during burn-in, so the averaged
	// samples come from one fixed model.
	BurnIn int
	// Samples is the number of states, evenly spaced over the sweeps after burn-in, whose
	// φ and θ estimates are averaged. Zero means 10.
	Samples int
	// Alpha is the initial symmetric document-theme prior α_k. Zero means 5/K (a sum of 5;
	// common practice for short documents, from memory of MALLET's default).
	Alpha float64
	// Beta is the initial symmetric theme-word prior β. Zero means 0.01 (common practice).
	Beta float64
	// FixedPriors keeps α and β at their initial values. The zero value (false) re-estimates
	// an asymmetric α and a symmetric β by Minka's fixed-point iteration during burn-in.
	FixedPriors bool
	// Seed seeds every random stream of the fit. Zero is a valid seed.
	Seed uint64
	// Partitions is the number of fixed document blocks sampled in parallel between
	// synchronised merges (AD-LDA, Newman et al. 2009). The result depends on Partitions but
	// not on GOMAXPROCS. Zero means 2; 1 gives the exact sequential sampler.
	Partitions int
	// Chains is the number of independent chains (chain c is seeded with
	// Seed + c·0x9E3779B97F4A7C15, so chains of neighbouring seeds do not coincide). The chain with
	// the highest final log p(w|z) is kept and the matched top-word Jaccard agreement of the
	// others with it is reported as Model.Stability. Chains run concurrently (with
	// Partitions = 1 and Chains = 2 that is one chain per core); each is deterministic, so
	// the result does not depend on GOMAXPROCS. Zero means 1.
	Chains int
	// Seeds names guided themes by seed words; they become themes 0..len(Seeds)-1.
	Seeds []SeedTheme
	// SeedStrength scales the extra prior mass a seed word gets in its theme: η_w =
	// SeedStrength × (corpus count of w). Zero means 1.
	SeedStrength float64
	// Progress, if not nil, is called from Fit's goroutine after every sweep of every chain
	// with the sweeps done so far and the total number of sweeps.
	Progress func(done, total int) `json:"-"`

	sampler   samplerKind // for measurement only; zero chooses by K
	optFrom   int         // for measurement only: first sweep that re-estimates priors
	fixedBeta bool        // for measurement only
}

type samplerKind int

const (
	autoSampler samplerKind = iota
	sparseSampler
	denseSampler
)

// sparseFromK is the number of themes from which the SparseLDA bucket sampler is used; below
// it the plain sampler is faster. Measured with BenchmarkSweep on the benchmark corpus
// (18,000 documents of ~60 tokens, V = 3,000), CPU ns per token: K = 20 sparse 94.5, dense
// 63.1; K = 100 sparse 153, dense 204; the lines cross near K = 50. A third candidate,
// an alias-table Metropolis–Hastings sampler (AliasLDA, Li, Ahmed, Ravi & Smola 2014), was
// written and measured on the same corpus and dropped: 81.7 ns at K = 20 (dense 54.9,
// sparse 88.0 in that run) and 263 ns at K = 100 (sparse 122, dense 188) — its per-word
// tables do not stay in cache — and it mixed worse on the bars test (worst bar at
// Hellinger 0.176 against 0.128 for SparseLDA after 200 sweeps on 600 documents).
const sparseFromK = 50

// resolved returns s with zero values replaced by defaults, or an error.
func (s Settings) resolved() (Settings, error) {
	if s.K < 1 {
		return s, fmt.Errorf("topics: K = %d, need at least 1 theme", s.K)
	}
	if s.K > 1<<15 {
		return s, fmt.Errorf("topics: K = %d is more than %d themes", s.K, 1<<15)
	}
	if s.Iterations == 0 {
		s.Iterations = 150
	}
	if s.BurnIn == 0 {
		s.BurnIn = s.Iterations / 2
	}
	if s.Samples == 0 {
		s.Samples = 10
	}
	if s.Alpha == 0 {
		s.Alpha = 5 / float64(s.K)
	}
	if s.Beta == 0 {
		s.Beta = 0.01
	}
	if s.Partitions == 0 {
		s.Partitions = 2
	}
	if s.Chains == 0 {
		s.Chains = 1
	}
	if s.SeedStrength == 0 {
		s.SeedStrength = 1
	}
	if s.sampler == autoSampler {
		s.sampler = denseSampler
		if s.K >= sparseFromK {
			s.sampler = sparseSampler
		}
	}
	switch {
	case s.Iterations < 1:
		return s, fmt.Errorf("topics: Iterations = %d, need at least 1", s.Iterations)
	case s.BurnIn < 0 || s.BurnIn >= s.Iterations:
		return s, fmt.Errorf("topics: BurnIn = %d, need 0 ≤ BurnIn < Iterations (%d)", s.BurnIn, s.Iterations)
	case s.Samples < 1 || s.Samples > s.Iterations-s.BurnIn:
		return s, fmt.Errorf("topics: Samples = %d, need 1..%d (sweeps after burn-in)", s.Samples, s.Iterations-s.BurnIn)
	case !(s.Alpha > 0) || !(s.Beta > 0):
		return s, fmt.Errorf("topics: priors must be positive (Alpha %g, Beta %g)", s.Alpha, s.Beta)
	case s.Partitions < 1 || s.Chains < 1:
		return s, fmt.Errorf("topics: Partitions (%d) and Chains (%d) must be positive", s.Partitions, s.Chains)
	case !(s.SeedStrength > 0):
		return s, fmt.Errorf("topics: SeedStrength %g must be positive", s.SeedStrength)
	case len(s.Seeds) > s.K:
		return s, fmt.Errorf("topics: %d seed themes but only K = %d themes", len(s.Seeds), s.K)
	}
	return s, nil
}

// fitRecord is the part of Settings stored in the model file.
type fitRecord struct {
	K            int         `json:"k"`
	Iterations   int         `json:"iterations"`
	BurnIn       int         `json:"burn_in"`
	Samples      int         `json:"samples"`
	Alpha        float64     `json:"initial_alpha"`
	Beta         float64     `json:"initial_beta"`
	FixedPriors  bool        `json:"fixed_priors"`
	Seed         uint64      `json:"seed"`
	Partitions   int         `json:"partitions"`
	Chains       int         `json:"chains"`
	SeedStrength float64     `json:"seed_strength"`
	Seeds        []SeedTheme `json:"seed_themes,omitempty"`
}

func (s Settings) record() fitRecord {
	return fitRecord{s.K, s.Iterations, s.BurnIn, s.Samples, s.Alpha, s.Beta, s.FixedPriors,
		s.Seed, s.Partitions, s.Chains, s.SeedStrength, s.Seeds}
}

// FitSettings returns the resolved settings the model was fitted with (every default filled
// in), as stored in the model file; Progress is nil.
func (m *Model) FitSettings() Settings {
	r := m.fit
	return Settings{K: r.K, Iterations: r.Iterations, BurnIn: r.BurnIn, Samples: r.Samples, Alpha: r.Alpha,
		Beta: r.Beta, FixedPriors: r.FixedPriors, Seed: r.Seed, Partitions: r.Partitions, Chains: r.Chains,
		SeedStrength: r.SeedStrength, Seeds: r.Seeds}
}
