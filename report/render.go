package report

import (
	"bytes"
	"crypto/sha256"
	"embed"
	"encoding/base64"
	"errors"
	"fmt"
	"html/template"
	"io"
	"math"
	"os"
	"path/filepath"
	"regexp"
	"slices"
	"strconv"
	"strings"
)

//go:embed templates/*.tmpl
var templateFS embed.FS

// echartsJS is the browser runtime, npm echarts@6.1.0 dist/echarts.min.js, checked by
// assets/verify.sh against assets/PROVENANCE.
//
//go:embed assets/echarts.min.js
var echartsJS string

// appJS is our own page script: it draws the charts from the page's JSON block, sorts
// the overview table and runs the search box. It is code, never built from data.
//
//go:embed templates/app.js
var appJS string

// EchartsNotice is the licence notice of the embedded echarts runtime (Apache-2.0); ship
// it with any binary that embeds this package.
//
//go:embed assets/NOTICE.echarts
var EchartsNotice string

// EchartsLicense is the Apache License 2.0 text of the embedded echarts runtime.
//
//go:embed assets/LICENSE.echarts
var EchartsLicense string

var pageTemplate = template.Must(template.New("page").
	Option("missingkey=error").
	Funcs(template.FuncMap{
		"pct":   fmtPct,
		"pct1":  func(v float64) string { return strconv.FormatFloat(v*100, 'f', 1, 64) },
		"num":   fmtInt,
		"f1":    func(v float64) string { return strconv.FormatFloat(v, 'f', 1, 64) },
		"f3":    func(v float64) string { return strconv.FormatFloat(v, 'f', 3, 64) },
		"join":  strings.Join,
		"add":   func(a, b int) int { return a + b },
		"plain": plainText,
	}).
	ParseFS(templateFS, "templates/*.tmpl"))

// pageCSP is the page's Content-Security-Policy. It allows exactly two scripts, by
// their SHA-256 hashes (CSP Level 2, "hash-source"): the echarts runtime and our own
// script, both fixed at build time. The chart options are in a JSON block that is data,
// not script. So even markup that slipped through escaping could run no script, and the
// page may load nothing (default-src 'none'); only data: images (echarts' own) and
// inline styles (echarts sizes its canvases with them) are allowed.
var pageCSP string

func init() {
	// The runtime is inserted into a <script> element unescaped (it is code we ship, not
	// data); make sure nothing in it can end the element early.
	low := strings.ToLower(echartsJS)
	if strings.Contains(low, "</script") || strings.Contains(low, "<!--") {
		panic("report: embedded echarts runtime contains </script or <!--")
	}
	if strings.Contains(strings.ToLower(appJS), "</script") {
		panic("report: app.js contains </script")
	}
	pageCSP = "default-src 'none'; script-src " + scriptHash(echartsJS) + " " + scriptHash(appJS) +
		"; style-src 'unsafe-inline'; img-src data:; connect-src 'none'; font-src 'none'; form-action 'none'; base-uri 'none'"
}

func scriptHash(s string) string {
	sum := sha256.Sum256([]byte(s))
	return "'sha256-" + base64.StdEncoding.EncodeToString(sum[:]) + "'"
}

// Render writes the report for d to w as one self-contained HTML page. The page is
// rendered into memory first: on error nothing is written. Render does not modify d.
func Render(w io.Writer, d *Data) error {
	var buf bytes.Buffer
	if err := render(&buf, d); err != nil {
		return err
	}
	_, err := w.Write(buf.Bytes())
	return err
}

// WriteFile renders the report for d and writes it to path. It writes a temporary file
// in the same directory and renames it over path only when everything succeeded, so a
// failed run never leaves a partial report.
func WriteFile(path string, d *Data) (err error) {
	var buf bytes.Buffer
	if err := render(&buf, d); err != nil {
		return err
	}
	f, err := os.CreateTemp(filepath.Dir(path), "."+filepath.Base(path)+".*.tmp")
	if err != nil {
		return err
	}
	defer func() {
		if err != nil {
			f.Close()
			os.Remove(f.Name())
		}
	}()
	if _, err = f.Write(buf.Bytes()); err != nil {
		return err
	}
	if err = f.Chmod(0o644); err != nil {
		return err
	}
	if err = f.Close(); err != nil {
		return err
	}
	return os.Rename(f.Name(), path)
}

// page is what the template sees.
type page struct {
	D          *Data
	Title      string
	Cautions   []string
	Months     []string
	Charts     []chartSpec
	Sizes      chartSpec
	Heatmap    chartSpec
	Tree       chartSpec
	TreeRows   []treeRow
	TreeLabels map[int]string
	K          chartSpec
	Mixture    chartSpec
	MixNames   []string
	MixRows    []mixRow
	Themes     []themeView
	Rejected   int
	Balanced   bool
	Runtime    template.JS
	App        template.JS
	CSP        string
	HeatRows   []heatRow
}

type themeView struct {
	T         *Theme
	Anchor    string
	Trend     chartSpec
	GroupRows []groupRow
	GroupMax  string
	Spark     []string
	Flags     int
	Shown     []Example
}

// groupRow is one group's share drawn as a dot and its interval as a line, on a
// 150-pixel scale common to the theme's groups.
type groupRow struct {
	G          GroupShare
	X0, X1, Cx float64
}

// groupRows places the groups on a scale from 0 to the largest upper end, rounded up to a
// whole 5%.
func groupRows(gs []GroupShare) ([]groupRow, string) {
	if len(gs) == 0 {
		return nil, ""
	}
	top := 0.05
	for _, g := range gs {
		if !g.Withheld {
			top = math.Max(top, math.Ceil(g.High*20-1e-9)/20)
		}
	}
	x := func(v float64) float64 { return math.Round(150*math.Min(math.Max(v/top, 0), 1)*10) / 10 }
	rows := make([]groupRow, len(gs))
	for i, g := range gs {
		rows[i] = groupRow{G: g}
		if !g.Withheld {
			rows[i].X0, rows[i].X1, rows[i].Cx = x(g.Low), x(g.High), x(g.Share)
		}
	}
	return rows, strconv.FormatFloat(top*100, 'f', 0, 64) + "%"
}

type treeRow struct {
	Step          int
	Left, Right   string
	Height        float64
	LeftN, RightN int
}

type heatRow struct {
	Label string
	Cells []string
}

// ValidationError reports Data that cannot be shown.
type ValidationError struct {
	Field string
	Err   error
}

func (e *ValidationError) Error() string { return "report: " + e.Field + ": " + e.Err.Error() }
func (e *ValidationError) Unwrap() error { return e.Err }

var monthRE = regexp.MustCompile(`^[0-9]{4}-(0[1-9]|1[0-2])$`)

// ErrInvalid is wrapped by every ValidationError.
var ErrInvalid = errors.New("invalid report data")

func invalid(field, format string, a ...any) error {
	return &ValidationError{Field: field, Err: fmt.Errorf("%w: "+format, append([]any{ErrInvalid}, a...)...)}
}

// Validate checks that d can be shown: unique theme IDs, a well-formed tree, finite
// numbers.
func Validate(d *Data) error {
	if d == nil {
		return invalid("Data", "nil")
	}
	seen := map[int]bool{}
	for i, t := range d.Themes {
		if seen[t.ID] {
			return invalid(fmt.Sprintf("Themes[%d].ID", i), "theme %d appears twice", t.ID)
		}
		seen[t.ID] = true
		if strings.TrimSpace(t.Label) == "" {
			return invalid(fmt.Sprintf("Themes[%d].Label", i), "theme %d has no label", t.ID)
		}
		if !finite(t.Size.Expected, t.Size.Share) {
			return invalid(fmt.Sprintf("Themes[%d].Size", i), "size not finite")
		}
		for j, g := range t.Groups {
			if !finite(g.Share, g.Low, g.High) {
				return invalid(fmt.Sprintf("Themes[%d].Groups[%d]", i, j), "share or interval not finite")
			}
		}
		for j, e := range t.Examples {
			if !finite(e.Share) {
				return invalid(fmt.Sprintf("Themes[%d].Examples[%d].Share", i, j), "not finite")
			}
		}
		for j, p := range t.Months {
			if !monthRE.MatchString(p.Month) {
				return invalid(fmt.Sprintf("Themes[%d].Months[%d].Month", i, j), "%q is not YYYY-MM", p.Month)
			}
			if j > 0 && p.Month <= t.Months[j-1].Month {
				return invalid(fmt.Sprintf("Themes[%d].Months[%d].Month", i, j), "%s does not come after %s", p.Month, t.Months[j-1].Month)
			}
			for _, v := range []float64{p.Share, p.Low, p.High} {
				if math.IsNaN(v) || math.IsInf(v, 0) {
					return invalid(fmt.Sprintf("Themes[%d].Months[%d]", i, j), "share or interval not finite")
				}
			}
		}
	}
	for i, c := range d.Mixture.Columns {
		if len(c.Shares) != len(d.Mixture.Themes) {
			return invalid(fmt.Sprintf("Mixture.Columns[%d].Shares", i), "%d shares for %d themes", len(c.Shares), len(d.Mixture.Themes))
		}
		for _, v := range c.Shares {
			if !finite(v) || v < 0 || v > 1+1e-9 {
				return invalid(fmt.Sprintf("Mixture.Columns[%d].Shares", i), "share %v not in [0, 1]", v)
			}
		}
	}
	for i, g := range d.Copies.Listed {
		if !finite(g.LeastSimilarity, g.Example.Share) || g.LeastSimilarity < 0 || g.LeastSimilarity > 1 {
			return invalid(fmt.Sprintf("Copies.Listed[%d]", i), "similarity %v not in [0, 1]", g.LeastSimilarity)
		}
	}
	for i, r := range d.KChoice.Rows {
		if !finite(r.HeldOutLL, r.NPMI, r.UMass, r.Stability) {
			return invalid(fmt.Sprintf("KChoice.Rows[%d]", i), "measure not finite")
		}
	}
	n := len(d.Tree.Leaves)
	if len(d.Tree.Merges) > 0 && len(d.Tree.Merges) > n-1 {
		return invalid("Tree.Merges", "%d merges for %d leaves", len(d.Tree.Merges), n)
	}
	prev := math.Inf(-1)
	used := map[int]bool{}
	for j, m := range d.Tree.Merges {
		for _, c := range []int{m.Left, m.Right} {
			if c < 0 || c >= n+j {
				return invalid(fmt.Sprintf("Tree.Merges[%d]", j), "cluster %d does not exist yet", c)
			}
			if used[c] {
				return invalid(fmt.Sprintf("Tree.Merges[%d]", j), "cluster %d merged twice", c)
			}
			used[c] = true
		}
		if m.Left == m.Right {
			return invalid(fmt.Sprintf("Tree.Merges[%d]", j), "cluster %d merged with itself", m.Left)
		}
		if math.IsNaN(m.Height) || m.Height < prev {
			return invalid(fmt.Sprintf("Tree.Merges[%d]", j), "height %v below the previous merge", m.Height)
		}
		prev = m.Height
	}
	return nil
}

func finite(vs ...float64) bool {
	for _, v := range vs {
		if math.IsNaN(v) || math.IsInf(v, 0) {
			return false
		}
	}
	return true
}

func render(w *bytes.Buffer, d *Data) error {
	if err := Validate(d); err != nil {
		return err
	}
	p := &page{D: d, Title: d.Title, Runtime: template.JS(echartsJS), App: template.JS(appJS), CSP: pageCSP}
	if p.Title == "" {
		p.Title = "Narrative themes"
	}
	p.Cautions = append(BuiltinCautions(), d.Cautions...)
	for _, r := range d.Overview.Rejected {
		p.Rejected += r.Count
	}
	p.Balanced = d.Overview.Read == d.Overview.Kept+d.Overview.Routine+p.Rejected

	mset := map[string]bool{}
	for _, t := range d.Themes {
		for _, m := range t.Months {
			mset[m.Month] = true
		}
	}
	for m := range mset {
		p.Months = append(p.Months, m)
	}
	slices.Sort(p.Months)

	if len(d.Themes) > 0 {
		p.Sizes = sizeChart(d)
		p.Charts = append(p.Charts, p.Sizes)
	}
	for i := range d.Themes {
		t := &d.Themes[i]
		v := themeView{T: t, Anchor: fmt.Sprintf("theme-%d", t.ID), Spark: sparkline(t.Months)}
		if len(t.Months) > 0 {
			v.Trend = trendChart(t)
			p.Charts = append(p.Charts, v.Trend)
		}
		v.GroupRows, v.GroupMax = groupRows(t.Groups)
		for _, m := range t.Months {
			if m.Flag != "" {
				v.Flags++
			}
		}
		v.Shown = t.Examples[:min(len(t.Examples), 5)]
		p.Themes = append(p.Themes, v)
	}
	p.TreeLabels = map[int]string{}
	for _, l := range d.Tree.Leaves {
		p.TreeLabels[l.Theme] = l.Label
	}
	if len(d.Tree.Leaves) > 0 {
		p.Tree, _ = treeChart(&d.Tree)
		p.Charts = append(p.Charts, p.Tree)
		n := len(d.Tree.Leaves)
		size := make([]int, n+len(d.Tree.Merges))
		names := make([]string, n+len(d.Tree.Merges))
		for i, l := range d.Tree.Leaves {
			size[i], names[i] = 1, l.Label
		}
		for j, m := range d.Tree.Merges {
			size[n+j] = size[m.Left] + size[m.Right]
			names[n+j] = fmt.Sprintf("group from step %d", j+1)
			p.TreeRows = append(p.TreeRows, treeRow{Step: j + 1, Left: names[m.Left], Right: names[m.Right], Height: m.Height, LeftN: size[m.Left], RightN: size[m.Right]})
		}
	}
	if len(d.Mixture.Columns) > 0 {
		p.Mixture, p.MixNames, p.MixRows = mixtureChart(d)
		if len(p.MixNames) > 0 {
			p.Charts = append(p.Charts, p.Mixture)
		} else {
			p.Mixture = chartSpec{}
		}
	}
	if len(d.Themes) > 0 && len(p.Months) > 0 {
		p.Heatmap = heatmapChart(d, p.Months)
		p.Charts = append(p.Charts, p.Heatmap)
		for _, t := range d.Themes {
			at := map[string]MonthPoint{}
			for _, m := range t.Months {
				at[m.Month] = m
			}
			r := heatRow{Label: t.Label}
			for _, m := range p.Months {
				mp, ok := at[m]
				switch {
				case !ok || mp.Gap:
					r.Cells = append(r.Cells, "no data")
				case mp.Withheld:
					r.Cells = append(r.Cells, "withheld")
				default:
					r.Cells = append(r.Cells, fmtPct(mp.Share))
				}
			}
			p.HeatRows = append(p.HeatRows, r)
		}
	}
	if len(d.KChoice.Rows) > 0 {
		p.K = kChart(&d.KChoice)
		p.Charts = append(p.Charts, p.K)
	}
	return pageTemplate.ExecuteTemplate(w, "page.html.tmpl", p)
}

// sparkline returns SVG polyline point lists (one per run without gaps) for a 120×28
// box, from the monthly shares.
func sparkline(ms []MonthPoint) []string {
	if len(ms) < 2 {
		return nil
	}
	var top float64
	for _, m := range ms {
		if !m.Gap && !m.Withheld {
			top = math.Max(top, m.High)
		}
	}
	if top == 0 {
		top = 1
	}
	var out []string
	var cur []string
	var lastX, lastY float64
	pt := func(x, y float64) string {
		return strconv.FormatFloat(x, 'f', 1, 64) + "," + strconv.FormatFloat(y, 'f', 1, 64)
	}
	flush := func() {
		if len(cur) == 1 { // a single point: draw a short tick
			cur = []string{pt(lastX-1.5, lastY), pt(lastX+1.5, lastY)}
		}
		if len(cur) > 0 {
			out = append(out, strings.Join(cur, " "))
		}
		cur = nil
	}
	for i, m := range ms {
		if m.Gap || m.Withheld {
			flush()
			continue
		}
		lastX = 1 + 118*float64(i)/float64(len(ms)-1)
		lastY = 27 - 26*m.Share/top
		cur = append(cur, pt(lastX, lastY))
	}
	flush()
	if len(out) == 0 {
		return nil
	}
	return out
}

func fmtPct(v float64) string {
	return strconv.FormatFloat(v*100, 'f', 1, 64) + "%"
}

func fmtInt(n int) string {
	s := strconv.Itoa(n)
	neg := strings.HasPrefix(s, "-")
	s = strings.TrimPrefix(s, "-")
	var b strings.Builder
	for i, r := range s {
		if i > 0 && (len(s)-i)%3 == 0 {
			b.WriteRune(',')
		}
		b.WriteRune(r)
	}
	if neg {
		return "-" + b.String()
	}
	return b.String()
}

// plainText joins segments back into the narrative, for search.
func plainText(segs []Segment) string {
	var b strings.Builder
	for _, s := range segs {
		b.WriteString(s.Text)
	}
	return b.String()
}
