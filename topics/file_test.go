package topics

import (
	"bytes"
	"context"
	"encoding/json"
	"errors"
	"fmt"
	"runtime"
	"strings"
	"testing"
)

// smallModel fits a quick model on a corpus drawn from 4 random topics over 40 words.
func smallModel(t *testing.T, s Settings) (*Model, generated) {
	t.Helper()
	phi := make([][]float64, 4)
	for k := range phi {
		phi[k] = make([]float64, 40)
		for w := 0; w < 10; w++ {
			phi[k][k*10+w] = 0.1
		}
	}
	g := generate(3, phi, 300, 30, 0.3)
	vocab := make([]string, 40)
	disp := make([]string, 40)
	for i := range vocab {
		vocab[i] = fmt.Sprintf("term%02d", i)
		disp[i] = fmt.Sprintf("Term %d", i)
	}
	if s.K == 0 {
		s.K = 4
	}
	if s.Iterations == 0 {
		s.Iterations = 60
	}
	m, err := Fit(context.Background(), Corpus{Counts: countMatrix(g.docs, 40), Vocabulary: vocab,
		Display: disp, Pipeline: json.RawMessage(`{"stem": true, "min_df": 2}`)}, s)
	if err != nil {
		t.Fatal(err)
	}
	return m, g
}

func saved(t *testing.T, m *Model) []byte {
	t.Helper()
	var buf bytes.Buffer
	if err := m.Save(&buf); err != nil {
		t.Fatal(err)
	}
	return buf.Bytes()
}

// TestDeterminismAcrossGOMAXPROCS checks the rule "same input, settings and seed →
// byte-identical output whatever GOMAXPROCS" (RULES.md) on the saved model file, over
// partitions, concurrent chains and both samplers, so every goroutine path runs.
func TestDeterminismAcrossGOMAXPROCS(t *testing.T) {
	for _, s := range []Settings{
		{Seed: 42, Chains: 2, Partitions: 2},
		{Seed: 42, Chains: 2, Partitions: 1},
		{Seed: 42, Partitions: 3, sampler: sparseSampler},
	} {
		prev := runtime.GOMAXPROCS(1)
		m1, _ := smallModel(t, s)
		b1 := saved(t, m1)
		runtime.GOMAXPROCS(2)
		m2, _ := smallModel(t, s)
		b2 := saved(t, m2)
		runtime.GOMAXPROCS(prev)
		if !bytes.Equal(b1, b2) {
			t.Fatalf("%+v: model files differ between GOMAXPROCS 1 and 2", s)
		}
		s.Seed++
		m3, _ := smallModel(t, s)
		if bytes.Equal(b1, saved(t, m3)) {
			t.Fatalf("%+v: a different seed gave the same model file", s)
		}
	}
}

func TestSaveLoadRoundTrip(t *testing.T) {
	m, _ := smallModel(t, Settings{Seed: 1})
	b := saved(t, m)
	got, err := Load(bytes.NewReader(b))
	if err != nil {
		t.Fatal(err)
	}
	if !bytes.Equal(b, saved(t, got)) {
		t.Fatal("Load then Save did not reproduce the file")
	}
	if got.K() != 4 || got.V() != 40 || got.Beta() != m.Beta() || got.InputFingerprint() != m.InputFingerprint() {
		t.Fatalf("loaded model differs: K %d V %d", got.K(), got.V())
	}
	if string(got.Pipeline()) != `{"stem":true,"min_df":2}` {
		t.Fatalf("pipeline settings %s", got.Pipeline())
	}
	if got.HasDocTopics() {
		t.Fatal("loaded model claims θ")
	}
}

func TestLoadRejects(t *testing.T) {
	m, _ := smallModel(t, Settings{Seed: 1})
	b := saved(t, m)
	hdrEnd := bytes.IndexByte(b[len(fileMagic)+1:], '\n') + len(fileMagic) + 1
	cases := []struct {
		name string
		edit func([]byte) []byte
		want string
	}{
		{"other version", func(b []byte) []byte {
			return bytes.Replace(b, []byte(`"format_version":1`), []byte(`"format_version":2`), 1)
		}, "format version 2"},
		{"edited vocabulary", func(b []byte) []byte {
			return bytes.Replace(b, []byte(`"term03"`), []byte(`"term3x"`), 1)
		}, "checksum mismatch"},
		{"edited phi byte", func(b []byte) []byte { b[hdrEnd+5] ^= 1; return b }, "checksum mismatch"},
		{"truncated", func(b []byte) []byte { return b[:len(b)-10] }, "truncated or edited"},
		{"not a model", func(b []byte) []byte { return []byte("id,text\n1,hello\n") }, "not an undercurrent theme model"},
		{"bad json", func(b []byte) []byte {
			return append([]byte(fileMagic+"\n{oops\n"), b[hdrEnd+1:]...)
		}, "not valid JSON"},
	}
	for _, c := range cases {
		t.Run(c.name, func(t *testing.T) {
			_, err := Load(bytes.NewReader(c.edit(bytes.Clone(b))))
			if err == nil || !errors.Is(err, ErrModelFile) || !strings.Contains(err.Error(), c.want) {
				t.Fatalf("got %v, want error containing %q", err, c.want)
			}
		})
	}
}

func TestFitRejectsBadCounts(t *testing.T) {
	b := countMatrix([][]int32{{0, 1}, {1, 2}}, 3)
	b.Data[2] = 1.5
	_, err := Fit(context.Background(), Corpus{Counts: b}, Settings{K: 2})
	if err == nil || !strings.Contains(err.Error(), "row 1, column 1") {
		t.Fatalf("got %v", err)
	}
	_, err = Fit(context.Background(), Corpus{Counts: countMatrix(nil, 3)}, Settings{K: 2})
	if err == nil || !strings.Contains(err.Error(), "no tokens") {
		t.Fatalf("got %v", err)
	}
	_, err = Fit(context.Background(), Corpus{Counts: countMatrix([][]int32{{0}}, 3)}, Settings{})
	if err == nil || !strings.Contains(err.Error(), "K = 0") {
		t.Fatalf("got %v", err)
	}
}

// FitSettings survives Save and Load: the file stores the resolved settings.
func TestFitSettingsRoundTrip(t *testing.T) {
	m, _ := smallModel(t, Settings{Seed: 5})
	var buf bytes.Buffer
	if err := m.Save(&buf); err != nil {
		t.Fatal(err)
	}
	got, err := Load(&buf)
	if err != nil {
		t.Fatal(err)
	}
	a, b := m.FitSettings(), got.FitSettings()
	if a.K != b.K || a.Iterations != b.Iterations || a.BurnIn != b.BurnIn || a.Samples != b.Samples || a.Seed != b.Seed ||
		a.Chains != b.Chains || a.Partitions != b.Partitions || a.Alpha != b.Alpha || a.Beta != b.Beta {
		t.Errorf("FitSettings after Load = %+v, want %+v", b, a)
	}
	if a.Iterations == 0 || a.Samples == 0 {
		t.Errorf("FitSettings not resolved: %+v", a)
	}
}
