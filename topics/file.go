package topics

import (
	"bufio"
	"bytes"
	"crypto/sha256"
	"encoding/binary"
	"encoding/hex"
	"encoding/json"
	"errors"
	"fmt"
	"io"
	"math"
)

// FormatVersion is the version of the model file layout written by Save.
const FormatVersion = 1

// fileMagic is the first line of every model file.
const fileMagic = "undercurrent theme model"

// ErrModelFile is wrapped by every error Load returns about the file's content.
var ErrModelFile = errors.New("topics: bad model file")

// header is the JSON line of a model file.
type header struct {
	FormatVersion int             `json:"format_version"`
	K             int             `json:"k"`
	V             int             `json:"v"`
	Alpha         []float64       `json:"alpha"`
	Beta          float64         `json:"beta"`
	ThemeNames    []string        `json:"theme_names"`
	Vocabulary    []string        `json:"vocabulary"`
	Display       []string        `json:"display"`
	TermCounts    []int64         `json:"term_counts"`
	InputSHA256   string          `json:"input_sha256"`
	Pipeline      json.RawMessage `json:"pipeline"`
	Fit           fitRecord       `json:"fit"`
	Stability     *float64        `json:"stability"`
	ChainLogLik   []float64       `json:"chain_log_likelihood"`
	PhiEncoding   string          `json:"phi_encoding"`
}

const phiEncoding = "float64 little-endian, row-major K×V"

// Save writes the model to w in the model file format (version FormatVersion, our own):
//
//	line 1   "undercurrent theme model"
//	line 2   one line of JSON: format_version, k, v, alpha (K values), beta, theme_names,
//	         vocabulary, display, term_counts (training count of each word), input_sha256
//	         (Fingerprint of the training matrix), pipeline (the text pipeline's settings,
//	         verbatim), fit (the resolved Settings), stability (null with one chain),
//	         chain_log_likelihood, phi_encoding
//	then     φ: K×V IEEE-754 float64 values, little-endian, theme by theme (8·K·V bytes)
//	then     "\nsha256 " + 64 hex digits + "\n": the SHA-256 of every byte before the "\n"
//
// Numbers in the JSON use Go's shortest round-trip form, so a saved model loads to exactly
// the same values and the same model always gives the same bytes. θ of the training
// narratives is not saved.
func (m *Model) Save(w io.Writer) error {
	h := header{FormatVersion: FormatVersion, K: m.k, V: m.v, Alpha: m.alpha, Beta: m.beta,
		ThemeNames: m.names, Vocabulary: m.vocab, Display: m.display, TermCounts: m.freq,
		InputSHA256: m.fingerprint, Fit: m.fit, ChainLogLik: m.ChainLogLikelihood,
		PhiEncoding: phiEncoding}
	if len(m.pipeline) > 0 {
		var buf bytes.Buffer
		if err := json.Compact(&buf, m.pipeline); err != nil {
			return fmt.Errorf("topics: pipeline settings are not valid JSON: %w", err)
		}
		h.Pipeline = buf.Bytes()
	} else {
		h.Pipeline = json.RawMessage("null")
	}
	if !math.IsNaN(m.Stability) {
		s := m.Stability
		h.Stability = &s
	}
	js, err := json.Marshal(h)
	if err != nil {
		return fmt.Errorf("topics: encoding model header: %w", err)
	}
	sum := sha256.New()
	bw := bufio.NewWriter(io.MultiWriter(w, sum))
	bw.WriteString(fileMagic + "\n")
	bw.Write(js)
	bw.WriteByte('\n')
	var b [8]byte
	for _, p := range m.phi {
		binary.LittleEndian.PutUint64(b[:], math.Float64bits(p))
		bw.Write(b[:])
	}
	if err := bw.Flush(); err != nil {
		return err
	}
	_, err = fmt.Fprintf(w, "\nsha256 %s\n", hex.EncodeToString(sum.Sum(nil)))
	return err
}

// Load reads a model written by Save. A file that is not a model file, was written by
// another format version, was changed after it was written (checksum), or is inconsistent
// gives an error wrapping ErrModelFile that says which.
func Load(r io.Reader) (*Model, error) {
	data, err := io.ReadAll(r)
	if err != nil {
		return nil, err
	}
	bad := func(format string, args ...any) error {
		return fmt.Errorf("%w: "+format, append([]any{ErrModelFile}, args...)...)
	}
	if !bytes.HasPrefix(data, []byte(fileMagic+"\n")) {
		return nil, bad("not an undercurrent theme model (first line is not %q)", fileMagic)
	}
	rest := data[len(fileMagic)+1:]
	nl := bytes.IndexByte(rest, '\n')
	if nl < 0 {
		return nil, bad("header line is not terminated")
	}
	var h header
	if err := json.Unmarshal(rest[:nl], &h); err != nil {
		return nil, bad("header line 2 is not valid JSON: %v", err)
	}
	if h.FormatVersion != FormatVersion {
		return nil, bad("format version %d; this build reads version %d only (refit or use the matching release)", h.FormatVersion, FormatVersion)
	}
	if h.K < 1 || h.V < 1 || h.K > 1<<15 || int64(h.K)*int64(h.V) > 1<<31 {
		return nil, bad("implausible dimensions K = %d, V = %d", h.K, h.V)
	}
	body := len(fileMagic) + 1 + nl + 1 + 8*h.K*h.V
	trailer := fmt.Sprintf("\nsha256 %064x\n", 0)
	if len(data) != body+len(trailer) {
		return nil, bad("file is %d bytes, expected %d for K = %d, V = %d (truncated or edited)", len(data), body+len(trailer), h.K, h.V)
	}
	tr := data[body:]
	if !bytes.HasPrefix(tr, []byte("\nsha256 ")) || tr[len(tr)-1] != '\n' {
		return nil, bad("checksum line missing")
	}
	want := string(tr[len("\nsha256 ") : len(tr)-1])
	got := sha256.Sum256(data[:body])
	if want != hex.EncodeToString(got[:]) {
		return nil, bad("checksum mismatch: the file was changed after it was written")
	}
	switch {
	case len(h.Alpha) != h.K:
		return nil, bad("%d alpha values for K = %d", len(h.Alpha), h.K)
	case len(h.Vocabulary) != h.V || len(h.Display) != h.V || len(h.TermCounts) != h.V:
		return nil, bad("vocabulary (%d), display (%d) and term_counts (%d) must all have V = %d entries",
			len(h.Vocabulary), len(h.Display), len(h.TermCounts), h.V)
	case len(h.ThemeNames) != h.K:
		return nil, bad("%d theme names for K = %d", len(h.ThemeNames), h.K)
	case !(h.Beta > 0):
		return nil, bad("beta %v is not positive", h.Beta)
	case h.PhiEncoding != phiEncoding:
		return nil, bad("unknown phi_encoding %q", h.PhiEncoding)
	}
	for k, a := range h.Alpha {
		if !(a > 0) || math.IsInf(a, 0) {
			return nil, bad("alpha[%d] = %v is not positive and finite", k, a)
		}
	}
	m := &Model{k: h.K, v: h.V, alpha: h.Alpha, beta: h.Beta, vocab: h.Vocabulary,
		display: h.Display, names: h.ThemeNames, freq: h.TermCounts, fingerprint: h.InputSHA256,
		fit: h.Fit, ChainLogLikelihood: h.ChainLogLik, Stability: math.NaN()}
	if string(h.Pipeline) != "null" {
		m.pipeline = h.Pipeline
	}
	if h.Stability != nil {
		m.Stability = *h.Stability
	}
	m.phi = make([]float64, h.K*h.V)
	off := len(fileMagic) + 1 + nl + 1
	for i := range m.phi {
		m.phi[i] = math.Float64frombits(binary.LittleEndian.Uint64(data[off+8*i:]))
	}
	for k := 0; k < h.K; k++ {
		s := 0.0
		for w, p := range m.phi[k*h.V : (k+1)*h.V] {
			if !(p >= 0) || math.IsInf(p, 0) {
				return nil, bad("phi[%d][%d] = %v is not a probability", k, w, p)
			}
			s += p
		}
		if math.Abs(s-1) > 1e-6 {
			return nil, bad("theme %d's word probabilities sum to %v, not 1", k, s)
		}
	}
	return m, nil
}
