package report

import (
	"bufio"
	"crypto/sha256"
	"encoding/hex"
	"os"
	"strings"
	"testing"
)

// The embedded runtime and its licence files are the ones recorded in
// assets/PROVENANCE (the same check as `assets/verify.sh --offline`; the full check
// downloads the npm package again and compares it with the registry's integrity).
func TestEmbeddedAssets(t *testing.T) {
	f, err := os.Open("assets/PROVENANCE")
	if err != nil {
		t.Fatal(err)
	}
	defer f.Close()
	want := map[string]string{}
	sc := bufio.NewScanner(f)
	for sc.Scan() {
		k, v, ok := strings.Cut(sc.Text(), "=")
		if ok && !strings.HasPrefix(k, "#") {
			want[k] = v
		}
	}
	for name, content := range map[string]string{"echarts.min.js": echartsJS, "LICENSE.echarts": EchartsLicense, "NOTICE.echarts": EchartsNotice} {
		sum := sha256.Sum256([]byte(content))
		if got := hex.EncodeToString(sum[:]); got != want[name+".sha256"] {
			t.Errorf("%s: sha256 %s, PROVENANCE says %q", name, got, want[name+".sha256"])
		}
	}
	if want["version"] != "6.1.0" || !strings.HasPrefix(want["integrity"], "sha512-") {
		t.Errorf("PROVENANCE: version %q, integrity %q", want["version"], want["integrity"])
	}
}

// The example labels file in testdata parses and applies to the sample data.
func TestExampleLabelsFile(t *testing.T) {
	f, err := os.Open("testdata/labels.example.txt")
	if err != nil {
		t.Fatal(err)
	}
	defer f.Close()
	c, err := ParseLabels("testdata/labels.example.txt", f)
	if err != nil {
		t.Fatal(err)
	}
	d := Sample(SampleSettings{})
	if err := Apply(d, c, nil); err != nil {
		t.Fatal(err)
	}
	if len(d.Themes) != 10 || len(d.Hidden) != 1 || d.Curation.Statements != 6 {
		t.Errorf("%d themes, %d hidden, %d statements", len(d.Themes), len(d.Hidden), d.Curation.Statements)
	}
}
