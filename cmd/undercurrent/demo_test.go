package main

import (
	"bytes"
	"context"
	"html"
	"os"
	"path/filepath"
	"regexp"
	"runtime"
	"sort"
	"strings"
	"testing"
	"time"

	"undercurrent/text/demotown"
)

// demoArgs keep the end-to-end runs small enough for `make test` (the default demo is 6,000
// narratives and a sweep over K; these use 1,500 and a short sweep).
var demoArgs = []string{"-n", "1500", "-k-range", "6,9", "-iterations", "60", "-chains", "2"}

func runDemo(t *testing.T, out string, procs int) {
	t.Helper()
	old := runtime.GOMAXPROCS(procs)
	defer runtime.GOMAXPROCS(old)
	code, stdout, stderr := runArgs(t, append([]string{"demo", "-out", out}, demoArgs...)...)
	if code != exitOK {
		t.Fatalf("demo exit %d\nstderr:\n%s", code, stderr)
	}
	if got := strings.TrimSpace(stdout); got != filepath.Join(out, "report.html") {
		t.Fatalf("demo printed %q, want the report's path", got)
	}
}

// TestDemoEndToEnd runs the README's first command in a temporary folder and checks the
// accounting, the files and that no planted structured PII reaches a published file.
func TestDemoEndToEnd(t *testing.T) {
	out := t.TempDir()
	runDemo(t, out, 2)
	for _, name := range []string{"report.html", "rejects.csv", "themes.ucmodel", "narratives-wide.csv", "narratives-long.csv",
		"themes.csv", "monthly.csv", "monthly.json", "flags.csv", "trends.csv", "groups-district.csv", "groups-call-type.csv", "repairs.csv",
		"repeated-text.csv", "repeated-text.json"} {
		if st, err := os.Stat(filepath.Join(out, name)); err != nil || st.Size() == 0 {
			t.Errorf("%s missing or empty (%v)", name, err)
		}
	}
	// Accounting: every generated row is in the wide export or in rejects.csv.
	wide := readCSVFile(t, filepath.Join(out, "narratives-wide.csv"))
	rejects := readCSVFile(t, filepath.Join(out, "rejects.csv"))
	if got := len(wide) - 1 + len(rejects) - 1; got != 1500 {
		t.Errorf("wide rows + rejects = %d, want the 1500 generated", got)
	}
	// No planted e-mail, SSN, VIN or phone appears in any published file (they are the
	// structured types; names are checked by the redaction benchmark, since the heuristic
	// misses some).
	c := demotown.Generate(demotown.Config{Seed: 1, N: 1500, TemplateRate: demotown.DemoTemplateRate})
	var secrets []string
	for _, tr := range c.Truth {
		for _, p := range tr.PII {
			switch p.Type {
			case demotown.PIIEmail, demotown.PIISSN, demotown.PIIVIN:
				secrets = append(secrets, p.Text)
			}
		}
	}
	if len(secrets) == 0 {
		t.Fatal("the demo corpus planted no structured PII")
	}
	ents, _ := os.ReadDir(out)
	for _, e := range ents {
		if e.IsDir() || strings.Contains(e.Name(), "private") || e.Name() == "themes.ucmodel" {
			continue
		}
		b, err := os.ReadFile(filepath.Join(out, e.Name()))
		if err != nil {
			t.Fatal(err)
		}
		for _, s := range secrets {
			if bytes.Contains(b, []byte(s)) {
				t.Errorf("%s holds planted PII %q", e.Name(), s)
			}
		}
	}
	rep, _ := os.ReadFile(filepath.Join(out, "report.html"))
	// The report explains flagged months with exactly the published flag table's words, so
	// it never shows the details that flags.csv withholds (small-cell suppression).
	page := html.UnescapeString(string(rep))
	flags := readCSVFile(t, filepath.Join(out, "flags.csv"))
	for _, row := range flags[1:] {
		expl := row[len(row)-1]
		if strings.HasPrefix(row[2], routineLabel) {
			continue
		}
		if !strings.Contains(page, expl) {
			t.Errorf("flag explanation of %s theme %s is not the published one: %q", row[0], row[1], expl)
		}
	}
	// Repeated text: published rows name narratives by file:line, never by record id.
	for _, row := range readCSVFile(t, filepath.Join(out, "repeated-text.csv"))[1:] {
		if !regexp.MustCompile(`^incidents\.csv:[0-9]+$`).MatchString(row[3]) {
			t.Errorf("repeated-text.csv names a narrative %q, want file:line", row[3])
		}
	}
	for _, want := range []string{"[NAME-", "Wilson", "counsel", `id="repeated-text"`, "uc-chart-mixture"} {
		if !bytes.Contains(rep, []byte(want)) {
			t.Errorf("report lacks %q", want)
		}
	}
}

func readCSVFile(t *testing.T, path string) [][]string {
	t.Helper()
	b, err := os.ReadFile(path)
	if err != nil {
		t.Fatal(err)
	}
	return readCSV(t, string(b))
}

// TestDemoDeterministic: the same input, settings and seed give byte-identical outputs
// under GOMAXPROCS 1 and 2 (the brief's determinism rule).
func TestDemoDeterministic(t *testing.T) {
	a, b := t.TempDir(), t.TempDir()
	runDemo(t, a, 1)
	runDemo(t, b, 2)
	fa, fb := listFiles(t, a), listFiles(t, b)
	if strings.Join(fa, ",") != strings.Join(fb, ",") {
		t.Fatalf("different files:\n%v\n%v", fa, fb)
	}
	for _, name := range fa {
		x, _ := os.ReadFile(filepath.Join(a, name))
		y, _ := os.ReadFile(filepath.Join(b, name))
		if !bytes.Equal(x, y) {
			t.Errorf("%s differs between GOMAXPROCS=1 and 2 (%d vs %d bytes)", name, len(x), len(y))
		}
	}
}

func listFiles(t *testing.T, dir string) []string {
	var out []string
	filepath.WalkDir(dir, func(p string, d os.DirEntry, err error) error {
		if err == nil && !d.IsDir() {
			rel, _ := filepath.Rel(dir, p)
			out = append(out, rel)
		}
		return nil
	})
	sort.Strings(out)
	return out
}

// TestInterrupted cancels the job at several points, as Ctrl-C does: the command exits 130,
// and no file is left half-written under its final name (nothing *.partial remains, and
// every report.html present is complete).
func TestInterrupted(t *testing.T) {
	for _, after := range []time.Duration{50 * time.Millisecond, 300 * time.Millisecond, 800 * time.Millisecond, 1300 * time.Millisecond} {
		out := t.TempDir()
		ctx, cancel := context.WithCancel(context.Background())
		time.AfterFunc(after, cancel)
		var so, se bytes.Buffer
		e := &env{stdin: strings.NewReader(""), stdout: &so, stderr: &se, quiet: true}
		code := run(ctx, e, append([]string{"demo", "-out", out}, demoArgs...))
		cancel()
		if code != exitInterrupted && code != exitOK {
			t.Errorf("after %v: exit %d, want %d\n%s", after, code, exitInterrupted, se.String())
		}
		for _, f := range listFiles(t, out) {
			if strings.HasSuffix(f, ".partial") {
				t.Errorf("after %v: %s left behind", after, f)
			}
			if f == "report.html" {
				b, _ := os.ReadFile(filepath.Join(out, f))
				if !bytes.HasSuffix(bytes.TrimSpace(b), []byte("</html>")) {
					t.Errorf("after %v: report.html is incomplete", after)
				}
			}
		}
		if code == exitInterrupted && !strings.Contains(se.String(), "interrupted") {
			t.Errorf("after %v: stderr does not say it was interrupted:\n%s", after, se.String())
		}
	}
}
