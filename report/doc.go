// Package report renders the offline community-review report: one self-contained HTML
// page showing what the narratives are about, how each theme moves month by month, and
// redacted examples, plus the curation (labels) file that renames, merges and hides
// themes without refitting.
//
// # Use
//
// The caller fills a Data value (plain text only: everything is escaped on the page) and
// calls WriteFile (or Render for any io.Writer). A labels file is applied first:
//
//	c, err := report.ParseLabels("labels.txt", f) // errors: labels.txt:LINE:COL: ...
//	m, err := c.Map(k)                            // for the tagger: m.Fold(dst, theta)
//	err = report.Apply(d, c, recompute)           // relabel, merge, hide in d
//	err = report.WriteFile("report.html", d)      // temp file + rename, only on success
//
// Sample builds invented data of any size for demos, tests and benchmarks. The format
// of the labels file is documented in labels.go (see ParseLabels). Package
// report/export writes the CSV files that go beside the report.
//
// # How the page is made
//
// Charts are built with go-echarts (github.com/go-echarts/go-echarts/v2): only their
// option maps (JSON()) are used, after Validate(), with chart IDs set by us so that the
// same input gives a byte-identical page. They travel in a JSON block that html/template
// escapes. go-echarts' own page renderers are never used: they write options unescaped
// into <script> (see /work/shared/LIBNOTES.md). Sparklines and the group intervals are
// small inline SVG drawn here.
//
// The browser runtime is npm echarts@6.1.0 dist/echarts.min.js, embedded with go:embed
// and checked by assets/verify.sh against assets/PROVENANCE. The page loads nothing from
// the network; its Content-Security-Policy forbids it and lets only two scripts run,
// named by their SHA-256 hashes: that runtime and our own templates/app.js.
//
// Colours come from the Okabe–Ito palette (Okabe and Ito 2008), recommended for
// colour-blind readers by Wong (2011), Nature Methods 8:441; text colours meet the
// WCAG 2.1 contrast minimum (4.5:1). Fonts are the system's.
package report
