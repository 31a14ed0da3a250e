package topics

import (
	"bufio"
	"context"
	"encoding/json"
	"fmt"
	"math"
	"os"
	"path/filepath"
	"runtime"
	"strconv"
	"strings"
	"syscall"
	"testing"
	"time"

	"undercurrent/text/sparse"
)

// benchCorpus is the corpus written by testdata/bench_ref.py.
type benchCorpus struct {
	meta struct {
		Docs, Train, V, K int
		Alpha, Beta       float64
	}
	labels []int
	docs   [][]int32
	phi    [][]float64
}

func benchDir() string {
	if d := os.Getenv("UNDERCURRENT_BENCH_DIR"); d != "" {
		return d
	}
	return "/tmp/undercurrent-bench"
}

func readBenchCorpus(tb testing.TB) *benchCorpus {
	dir := benchDir()
	f, err := os.Open(filepath.Join(dir, "corpus.txt"))
	if err != nil {
		tb.Skipf("no benchmark corpus (run /usr/bin/python3 testdata/bench_ref.py %s): %v", dir, err)
	}
	defer f.Close()
	c := &benchCorpus{}
	sc := bufio.NewScanner(f)
	sc.Buffer(make([]byte, 1<<20), 1<<24)
	sc.Scan()
	if err := json.Unmarshal(sc.Bytes(), &c.meta); err != nil {
		tb.Fatal(err)
	}
	for sc.Scan() {
		fs := strings.Fields(sc.Text())
		lab, _ := strconv.Atoi(fs[0])
		doc := make([]int32, len(fs)-1)
		for i, s := range fs[1:] {
			x, _ := strconv.Atoi(s)
			doc[i] = int32(x)
		}
		c.labels = append(c.labels, lab)
		c.docs = append(c.docs, doc)
	}
	pf, err := os.ReadFile(filepath.Join(dir, "phi.txt"))
	if err != nil {
		tb.Fatal(err)
	}
	for _, line := range strings.Split(strings.TrimSpace(string(pf)), "\n") {
		var row []float64
		for _, s := range strings.Fields(line) {
			x, _ := strconv.ParseFloat(s, 64)
			row = append(row, x)
		}
		c.phi = append(c.phi, row)
	}
	return c
}

// completionLL is held-out document completion (Wallach et al. 2009): θ folded in from the
// first half of each document's tokens, the second half scored.
func completionLL(tg *Tagger, phi func(k, w int) float64, K int, docs [][]int32) float64 {
	ll, n := 0.0, 0
	for i, d := range docs {
		h := len(d) / 2
		th := tg.Infer(strconv.Itoa(i), d[:h])
		for _, w := range d[h:] {
			p := 0.0
			for k := 0; k < K; k++ {
				p += th[k] * phi(k, int(w))
			}
			ll += math.Log(p)
			n++
		}
	}
	return ll / float64(n)
}

func peakMB() float64 {
	b, err := os.ReadFile("/proc/self/status")
	if err != nil {
		return math.NaN()
	}
	for _, line := range strings.Split(string(b), "\n") {
		if strings.HasPrefix(line, "VmHWM:") {
			kb, _ := strconv.ParseFloat(strings.Fields(line)[1], 64)
			return kb / 1024
		}
	}
	return math.NaN()
}

// BenchmarkSynthetic fits the corpus of testdata/bench_ref.py and prints the same JSON line
// fields as that script, side by side with scikit-learn and gensim (make bench). Nothing is
// asserted on time.
func BenchmarkSynthetic(b *testing.B) {
	c := readBenchCorpus(b)
	train := countMatrix(c.docs[:c.meta.Train], c.meta.V)
	s := Settings{K: c.meta.K, Seed: 1}
	if v := os.Getenv("UNDERCURRENT_BENCH_ITER"); v != "" {
		s.Iterations, _ = strconv.Atoi(v)
	}
	for i := 0; i < b.N; i++ {
		start := time.Now()
		cpu0 := cpuTime()
		m, err := Fit(context.Background(), Corpus{Counts: train}, s)
		if err != nil {
			b.Fatal(err)
		}
		secs := time.Since(start).Seconds()
		cpu := (cpuTime() - cpu0).Seconds()
		_, dist := MatchHellinger(c.phi, rows(m))
		h := 0.0
		for _, d := range dist {
			h += d
		}
		tg := NewTagger(m, InferSettings{})
		ll := completionLL(tg, func(k, w int) float64 { return m.phi[k*m.v+w] }, m.k, c.docs[c.meta.Train:])
		nmi := NMI(c.labels[:c.meta.Train], m.Dominant())
		line, _ := json.Marshal(map[string]any{"bench": "synthetic-lda", "system": "undercurrent",
			"corpus": "D20000-V3000-K20", "seconds": round(secs, 3), "cpu_seconds_fit": round(cpu, 3), "peak_mb": round(peakMB(), 1),
			"hellinger": round(h/float64(len(dist)), 4), "ll_per_token": round(ll, 4), "nmi": round(nmi, 4),
			"gomaxprocs": runtime.GOMAXPROCS(0), "alpha_mean": round(mean(m.alpha), 4), "beta": round(m.beta, 4)})
		fmt.Println(string(line))
		if i == 0 {
			// The true model, scored the same way (fold-in with the true φ and α).
			tm := &Model{k: c.meta.K, v: c.meta.V, alpha: make([]float64, c.meta.K)}
			for k := range tm.alpha {
				tm.alpha[k] = c.meta.Alpha
			}
			for _, r := range c.phi {
				tm.phi = append(tm.phi, r...)
			}
			tll := completionLL(NewTagger(tm, InferSettings{}), func(k, w int) float64 { return c.phi[k][w] }, tm.k, c.docs[c.meta.Train:])
			line, _ := json.Marshal(map[string]any{"bench": "synthetic-lda", "system": "true-model",
				"corpus": "D20000-V3000-K20", "ll_per_token": round(tll, 4)})
			fmt.Println(string(line))
		}
	}
}

// BenchmarkSweep measures one Gibbs sweep of the benchmark corpus by each sampler (the
// measurement behind the sampler choice in Fit), sequentially (Partitions = 1), at the
// corpus's K = 20 and at K = 100. It reports CPU nanoseconds per token (getrusage), which
// a shared machine distorts less than wall time.
func BenchmarkSweep(b *testing.B) {
	c := readBenchCorpus(b)
	train := countMatrix(c.docs[:c.meta.Train], c.meta.V)
	words, ds, _ := tokens(train)
	for _, K := range []int{20, 100} {
		for _, sk := range []struct {
			name string
			k    samplerKind
		}{{"sparse", sparseSampler}, {"dense", denseSampler}} {
			b.Run(fmt.Sprintf("K%d-%s", K, sk.name), func(b *testing.B) {
				al := make([]float64, K)
				for i := range al {
					al[i] = 0.1
				}
				ch := newChain(K, c.meta.V, words, ds, al, 0.01, nil, nil, 1, 1, sk.k)
				for i := 0; i < 20; i++ { // past the random start
					ch.sweep()
				}
				b.ResetTimer()
				t0 := cpuTime()
				for i := 0; i < b.N; i++ {
					ch.sweep()
				}
				b.ReportMetric(float64((cpuTime()-t0).Nanoseconds())/float64(b.N*len(words)), "cpu-ns/token")
			})
		}
	}
}

func cpuTime() time.Duration {
	var ru syscall.Rusage
	syscall.Getrusage(syscall.RUSAGE_SELF, &ru)
	return time.Duration(ru.Utime.Nano() + ru.Stime.Nano())
}

func round(x float64, d int) float64 {
	p := math.Pow(10, float64(d))
	return math.Round(x*p) / p
}

func mean(x []float64) float64 {
	s := 0.0
	for _, v := range x {
		s += v
	}
	return s / float64(len(x))
}

var _ = sparse.NewBuilder
