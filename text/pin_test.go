package text

import (
	"context"
	"crypto/sha256"
	"encoding/hex"
	"encoding/json"
	"testing"
)

// TestOutputPinned checks that Build's whole output (Corpus and Frozen, as JSON: counts,
// vocabulary, display forms, document frequencies, routine flags, audit, expansions, phrases)
// and Frozen.Transform's output on the first narratives are byte-identical to what the code
// produced before the speed work of the textspeed branch. The hashes were computed with that
// code (commit 78b5097) and pinned here; a speed change must not move them. A deliberate
// change of the pipeline's rules must update them and say why in the commit. Re-pinned on
// the sentences branch: the build hashes moved only by Settings.Version 1 → 2 (the sentence
// step's settings, off by default); the transform hashes did not move.
func TestOutputPinned(t *testing.T) {
	cases := []struct {
		name             string
		docs             func(t *testing.T) []string
		build, transform string
	}{
		{"osha", func(t *testing.T) []string { return loadOSHA(t, 0) },
			"649292769749fdc7afec1b66dc9243b74c3dd39409f1110a3bc3255033b026c0",
			"0cf3d5d60ba557c05a85ea0b27015f34ca060a3a7d033d2f955ecbc92cd3bb67"},
		{"generated-100k", func(t *testing.T) []string {
			if testing.Short() {
				t.Skip("generated 100k corpus skipped in -short mode")
			}
			return genCorpus(100000, 1)
		},
			"a5f2350a1c3ae06cef5b90844620495c1a10ef7c33d4980537ea62c40d2d7a48",
			"b89a31e18aab353bbe7a725ad0bcb8ba7e90133e4c518d24276a411999d24a44"},
	}
	for _, tc := range cases {
		t.Run(tc.name, func(t *testing.T) {
			docs := tc.docs(t)
			c, f, err := Build(context.Background(), docs, DefaultSettings())
			if err != nil {
				t.Fatal(err)
			}
			b, err := json.Marshal(struct {
				C *Corpus
				F *Frozen
			}{c, f})
			if err != nil {
				t.Fatal(err)
			}
			hb := sha256.Sum256(b)
			h := sha256.New()
			for _, d := range docs[:min(len(docs), 3000)] {
				tb, err := json.Marshal(f.Transform(d))
				if err != nil {
					t.Fatal(err)
				}
				h.Write(tb)
			}
			gotBuild, gotTransform := hex.EncodeToString(hb[:]), hex.EncodeToString(h.Sum(nil))
			if gotBuild != tc.build || gotTransform != tc.transform {
				t.Errorf("%s: output moved:\n build     %s (pinned %s)\n transform %s (pinned %s)", tc.name, gotBuild, tc.build, gotTransform, tc.transform)
			}
		})
	}
}
