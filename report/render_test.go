package report

import (
	"bytes"
	"os"
	"path/filepath"
	"strings"
	"testing"
)

// artifactDir is where tests leave files for a person to look at: $UNDERCURRENT_ARTIFACTS,
// or a temporary directory.
func artifactDir(t testing.TB) string {
	if d := os.Getenv("UNDERCURRENT_ARTIFACTS"); d != "" {
		if err := os.MkdirAll(d, 0o755); err != nil {
			t.Fatal(err)
		}
		return d
	}
	return t.TempDir()
}

func TestRenderSample(t *testing.T) {
	d := Sample(SampleSettings{Hostile: true, Seed: 7})
	var a, b bytes.Buffer
	if err := Render(&a, d); err != nil {
		t.Fatal(err)
	}
	if err := Render(&b, Sample(SampleSettings{Hostile: true, Seed: 7})); err != nil {
		t.Fatal(err)
	}
	if !bytes.Equal(a.Bytes(), b.Bytes()) {
		t.Fatal("two renders of the same data differ")
	}
	page := strings.Replace(a.String(), echartsJS, "", 1)
	for _, bad := range []string{HostileScript, HostileImg, "<img src=x", "src=\"http", "src=http", "https://cdn", "@import", "url("} {
		if strings.Contains(page, bad) {
			t.Errorf("page contains %q", bad)
		}
	}
	path := filepath.Join(artifactDir(t), "sample-report.html")
	if err := WriteFile(path, d); err != nil {
		t.Fatal(err)
	}
	t.Logf("sample report: %s (%d bytes)", path, a.Len())
}
