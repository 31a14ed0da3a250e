// Package report renders the offline community-review report: one self-contained HTML
// page showing what the narratives are about, how each theme moves month by month, and
// redacted examples, plus the curation (labels) file that renames, merges and hides
// themes without refitting.
//
// The caller fills a Data value (plain text only) and calls Render or WriteFile. Charts
// are built with go-echarts (github.com/go-echarts/go-echarts/v2); only their option
// maps (JSON()) are used, and they reach the page as data in html/template's script
// context, where they are escaped. go-echarts' own page renderers are never used: they
// write options unescaped into <script> (see /work/shared/LIBNOTES.md). The browser
// runtime is npm echarts@6.1.0 dist/echarts.min.js, embedded with go:embed and checked
// by assets/verify.sh against assets/PROVENANCE. The page loads nothing from the network,
// and its Content-Security-Policy forbids it and lets only two scripts run, named by
// their SHA-256 hashes: that runtime and our own templates/app.js. The chart options
// travel in a JSON block, which is data.
//
// Colours come from the Okabe–Ito palette (Okabe and Ito 2008), recommended for
// colour-blind readers by Wong (2011), Nature Methods 8:441.
package report
