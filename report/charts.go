package report

import (
	"fmt"
	"math"

	"github.com/go-echarts/go-echarts/v2/charts"
	"github.com/go-echarts/go-echarts/v2/opts"
)

// Palette is the colour-blind-safe palette of Okabe and Ito (2008, "Color Universal
// Design", https://jfly.uni-koeln.de/color/), as recommended by Wong (2011), "Points of
// view: Color blindness", Nature Methods 8:441. Order: black, orange, sky blue, bluish
// green, yellow, blue, vermillion, reddish purple.
var Palette = [8]string{"#000000", "#E69F00", "#56B4E9", "#009E73", "#F0E442", "#0072B2", "#D55E00", "#CC79A7"}

// Roles of the palette's colours in the page.
var (
	colLine   = Palette[5] // blue: a theme's share
	colBand   = Palette[2] // sky blue: its interval
	colFlag   = Palette[6] // vermillion: flagged months
	colAccent = Palette[1] // orange: recommended K, groups that stand out
	colInk    = "#1f2a36"
)

// chartSpec is one chart: the id of its container, its height in pixels and the echarts
// option as produced by go-echarts (JSON()). The option reaches the page as data in a
// script context, where html/template escapes it.
type chartSpec struct {
	ID     string
	Height int
	Label  string
	Option map[string]any
}

// chartLabelMax is the length at which labels drawn inside charts are cut; the tables
// beside the charts keep the whole label.
const chartLabelMax = 40

func shortLabel(s string) string {
	r := []rune(s)
	if len(r) <= chartLabelMax {
		return s
	}
	return string(r[:chartLabelMax-1]) + "…"
}

func pct(v float64) float64 { return math.Round(v*10000) / 100 }

func initOpts(id string) charts.GlobalOpts {
	return charts.WithInitializationOpts(opts.Initialization{ChartID: id, Renderer: "canvas"})
}

func commonOpts(id string) []charts.GlobalOpts {
	return []charts.GlobalOpts{
		initOpts(id),
		charts.WithAnimation(false),
		charts.WithColorsOpts(opts.Colors{Palette[5], Palette[1], Palette[3], Palette[6], Palette[7], Palette[2], Palette[0], Palette[4]}),
		charts.WithTooltipOpts(opts.Tooltip{Show: opts.Bool(true), Trigger: "axis"}),
		charts.WithLegendOpts(opts.Legend{Show: opts.Bool(false)}),
	}
}

// sizeChart is a horizontal bar per theme: its share of all kept narratives.
func sizeChart(d *Data) chartSpec {
	id := "uc-chart-sizes"
	bar := charts.NewBar()
	bar.SetGlobalOptions(commonOpts(id)...)
	bar.SetGlobalOptions(
		charts.WithGridOpts(opts.Grid{Left: "8", Right: "40", Top: "10", Bottom: "30", ContainLabel: opts.Bool(true)}),
		charts.WithXAxisOpts(opts.XAxis{Type: "value", Name: "% of all the text", NameLocation: "middle", NameGap: 24}),
	)
	labels := make([]string, len(d.Themes))
	vals := make([]opts.BarData, len(d.Themes))
	for i, t := range d.Themes {
		labels[i] = shortLabel(t.Label)
		vals[i] = opts.BarData{Value: pct(t.Size.Share)}
	}
	bar.SetGlobalOptions(charts.WithYAxisOpts(opts.YAxis{Type: "category", Inverse: opts.Bool(true), Data: labels}))
	bar.AddSeries("share of narratives (%)", vals, charts.WithItemStyleOpts(opts.ItemStyle{Color: colLine}))
	bar.Validate()
	o := bar.JSON()
	return chartSpec{ID: id, Height: 60 + 22*len(d.Themes), Label: "Size of each theme", Option: o}
}

// trendChart is a theme's monthly share with its Wilson band, flagged months marked.
func trendChart(t *Theme) chartSpec {
	id := fmt.Sprintf("uc-chart-trend-%d", t.ID)
	line := charts.NewLine()
	line.SetGlobalOptions(commonOpts(id)...)
	line.SetGlobalOptions(
		charts.WithTooltipOpts(opts.Tooltip{Show: opts.Bool(true), Trigger: "item"}),
		charts.WithGridOpts(opts.Grid{Left: "8", Right: "16", Top: "30", Bottom: "8", ContainLabel: opts.Bool(true)}),
		charts.WithYAxisOpts(opts.YAxis{Type: "value", Name: "% of month", Scale: opts.Bool(false)}),
	)
	// Three series only (each series costs drawing time in a report with many themes):
	// the band's lower end, its width stacked on it, and the share. Partly covered months
	// are hollow circles on the share line; flagged months are vermillion diamonds,
	// drawn as mark points of the share series.
	months := make([]string, len(t.Months))
	share := make([]opts.LineData, len(t.Months))
	low := make([]opts.LineData, len(t.Months))
	width := make([]opts.LineData, len(t.Months))
	var flags []opts.MarkPointNameCoordItem
	for i, p := range t.Months {
		months[i] = p.Month
		if p.Gap || p.Withheld {
			share[i], low[i], width[i] = opts.LineData{Value: "-"}, opts.LineData{Value: "-"}, opts.LineData{Value: "-"}
			continue
		}
		share[i] = opts.LineData{Value: pct(p.Share)}
		if p.Partial {
			share[i].Symbol, share[i].SymbolSize = "emptyCircle", 9
		}
		low[i] = opts.LineData{Value: pct(p.Low)}
		width[i] = opts.LineData{Value: math.Round((pct(p.High)-pct(p.Low))*100) / 100}
		if p.Flag != "" {
			flags = append(flags, opts.MarkPointNameCoordItem{
				Name: "flagged month", Coordinate: []any{p.Month, pct(p.Share)}, Value: p.Flag,
				Symbol: "diamond", SymbolSize: 16,
				ItemStyle: &opts.ItemStyle{Color: colFlag},
				Label:     &opts.Label{Show: opts.Bool(false)},
			})
		}
	}
	line.SetXAxis(months)
	// The band: the lower end, with the interval's width stacked on it and filled. The
	// tooltip is per point (trigger "item"), so only the share and the marks show in it;
	// the table beside the chart has both ends of every interval.
	noSym := charts.WithLineChartOpts(opts.LineChart{Stack: "band", ShowSymbol: opts.Bool(false), Symbol: "none"})
	line.AddSeries("95% interval, lower end (%)", low, noSym,
		charts.WithLineStyleOpts(opts.LineStyle{Opacity: opts.Float(0)}))
	line.AddSeries("95% interval, width (%)", width, noSym,
		charts.WithLineStyleOpts(opts.LineStyle{Opacity: opts.Float(0)}),
		charts.WithAreaStyleOpts(opts.AreaStyle{Color: colBand, Opacity: opts.Float(0.4)}))
	shareOpts := []charts.SeriesOpts{
		charts.WithLineChartOpts(opts.LineChart{Symbol: "circle", SymbolSize: 6}),
		charts.WithLineStyleOpts(opts.LineStyle{Color: colLine, Width: 2}),
		charts.WithItemStyleOpts(opts.ItemStyle{Color: colLine}),
	}
	if len(flags) > 0 {
		shareOpts = append(shareOpts, charts.WithMarkPointNameCoordItemOpts(flags...))
	}
	line.AddSeries("share (%)", share, shareOpts...)
	line.Validate()
	return chartSpec{ID: id, Height: 240, Label: "Monthly share of " + t.Label, Option: line.JSON()}
}

// treeChart draws the dendrogram with real merge heights: one three-segment line series
// per merge on value axes (height across, leaves down), and the leaf labels as a scatter
// series at height 0.
func treeChart(tr *Tree) (chartSpec, []int) {
	id := "uc-chart-tree"
	n := len(tr.Leaves)
	order := treeOrder(tr)
	ypos := make([]float64, n+len(tr.Merges))
	hgt := make([]float64, n+len(tr.Merges))
	for rank, leaf := range order {
		ypos[leaf] = float64(rank)
	}
	line := charts.NewLine()
	line.SetGlobalOptions(commonOpts(id)...)
	line.SetGlobalOptions(
		charts.WithTooltipOpts(opts.Tooltip{Show: opts.Bool(true), Trigger: "item"}),
		charts.WithGridOpts(opts.Grid{Left: "260", Right: "24", Top: "10", Bottom: "40"}),
		charts.WithXAxisOpts(opts.XAxis{Type: "value", Name: "merge height (distance)", NameLocation: "middle", NameGap: 26, Min: 0,
			AxisLine: &opts.AxisLine{Show: opts.Bool(true), OnZero: opts.Bool(false)}}),
		charts.WithYAxisOpts(opts.YAxis{Type: "value", Show: opts.Bool(false), Min: -0.5, Max: float64(n) - 0.5, Inverse: opts.Bool(true)}),
	)
	for j, m := range tr.Merges {
		c := n + j
		ypos[c] = (ypos[m.Left] + ypos[m.Right]) / 2
		hgt[c] = m.Height
		pts := []opts.LineData{
			{Value: []float64{hgt[m.Left], ypos[m.Left]}},
			{Value: []float64{m.Height, ypos[m.Left]}},
			{Value: []float64{m.Height, ypos[m.Right]}},
			{Value: []float64{hgt[m.Right], ypos[m.Right]}},
		}
		line.AddSeries(fmt.Sprintf("merge %d at %.3f", j+1, m.Height), pts,
			charts.WithLineChartOpts(opts.LineChart{Symbol: "none", ShowSymbol: opts.Bool(false)}),
			charts.WithLineStyleOpts(opts.LineStyle{Color: colInk, Width: 1.5}))
	}
	sc := charts.NewScatter()
	leaves := make([]opts.ScatterData, n)
	for rank, leaf := range order {
		leaves[rank] = opts.ScatterData{Name: shortLabel(tr.Leaves[leaf].Label), Value: []float64{0, float64(rank)}, SymbolSize: 6}
	}
	sc.AddSeries("themes", leaves,
		charts.WithLabelOpts(opts.Label{Show: opts.Bool(true), Position: "left", Formatter: "{b}", Color: colInk}),
		charts.WithItemStyleOpts(opts.ItemStyle{Color: colLine}))
	// Themes in a suggested pair get a vermillion diamond beside their dot.
	inPair := map[int]bool{}
	for _, sg := range tr.Suggestions {
		inPair[sg.A], inPair[sg.B] = true, true
	}
	var marks []opts.ScatterData
	for rank, leaf := range order {
		if inPair[tr.Leaves[leaf].Theme] {
			marks = append(marks, opts.ScatterData{Name: shortLabel(tr.Leaves[leaf].Label), Value: []float64{0, float64(rank)}, Symbol: "diamond", SymbolSize: 12})
		}
	}
	if len(marks) > 0 {
		sc.AddSeries("in a suggested pair", marks, charts.WithItemStyleOpts(opts.ItemStyle{Color: colFlag}))
	}
	line.Overlap(sc)
	line.Validate()
	return chartSpec{ID: id, Height: 40 + 26*max(n, 4), Label: "Theme tree", Option: line.JSON()}, order
}

// treeOrder returns the leaves in dendrogram order (left child first, depth first).
func treeOrder(tr *Tree) []int {
	n := len(tr.Leaves)
	if len(tr.Merges) == 0 {
		o := make([]int, n)
		for i := range o {
			o[i] = i
		}
		return o
	}
	var out []int
	seen := make([]bool, n)
	var walk func(c int)
	walk = func(c int) {
		if c < n {
			out = append(out, c)
			seen[c] = true
			return
		}
		m := tr.Merges[c-n]
		walk(m.Left)
		walk(m.Right)
	}
	walk(n + len(tr.Merges) - 1)
	for i, s := range seen { // leaves not reached by an incomplete tree
		if !s {
			out = append(out, i)
		}
	}
	return out
}

// heatmapChart shows each theme's monthly share as a colour; withheld and empty months
// are left blank.
func heatmapChart(d *Data, months []string) chartSpec {
	id := "uc-chart-heatmap"
	hm := charts.NewHeatMap()
	hm.SetGlobalOptions(commonOpts(id)...)
	labels := make([]string, len(d.Themes))
	// One series per theme row, named by the theme, so that the tooltip names the theme,
	// the month and the share.
	data := make([][]opts.HeatMapData, len(d.Themes))
	var top float64
	for ti, t := range d.Themes {
		labels[ti] = shortLabel(t.Label)
		at := make(map[string]MonthPoint, len(t.Months))
		for _, p := range t.Months {
			at[p.Month] = p
		}
		for mi, m := range months {
			p, ok := at[m]
			if !ok || p.Gap || p.Withheld {
				data[ti] = append(data[ti], opts.HeatMapData{Value: []any{mi, ti, "-"}})
				continue
			}
			v := pct(p.Share)
			top = math.Max(top, v)
			data[ti] = append(data[ti], opts.HeatMapData{Value: []any{mi, ti, v}})
		}
	}
	hm.SetGlobalOptions(
		charts.WithTooltipOpts(opts.Tooltip{Show: opts.Bool(true), Trigger: "item"}),
		charts.WithGridOpts(opts.Grid{Left: "8", Right: "16", Top: "10", Bottom: "70", ContainLabel: opts.Bool(true)}),
		charts.WithXAxisOpts(opts.XAxis{Type: "category", Data: months, SplitArea: &opts.SplitArea{Show: opts.Bool(true)}}),
		charts.WithYAxisOpts(opts.YAxis{Type: "category", Data: labels, Inverse: opts.Bool(true)}),
		charts.WithVisualMapOpts(opts.VisualMap{
			Calculable: opts.Bool(true), Min: 0, Max: float32(math.Ceil(math.Max(top, 1))),
			Orient: "horizontal", Left: "center", Bottom: "0",
			Text:    []string{"higher share", "lower"},
			InRange: &opts.VisualMapInRange{Color: []string{"#f4f1e8", Palette[2], Palette[5], "#0b2f4f"}},
		}),
	)
	for ti := range d.Themes {
		hm.AddSeries(labels[ti]+" (% of month)", data[ti])
	}
	hm.Validate()
	return chartSpec{ID: id, Height: 110 + 22*len(d.Themes), Label: "Themes month by month", Option: hm.JSON()}
}

// kChart shows the measures for each candidate K, each rescaled to 0–1 across the
// candidates (the table holds the raw values), with the chosen K marked.
func kChart(kc *KChoice) chartSpec {
	id := "uc-chart-k"
	line := charts.NewLine()
	line.SetGlobalOptions(commonOpts(id)...)
	line.SetGlobalOptions(
		charts.WithLegendOpts(opts.Legend{Show: opts.Bool(true), Top: "0", Left: "center"}),
		charts.WithGridOpts(opts.Grid{Left: "30", Right: "24", Top: "36", Bottom: "30", ContainLabel: opts.Bool(true)}),
		charts.WithXAxisOpts(opts.XAxis{Type: "category", Name: "number of themes (K)", NameLocation: "middle", NameGap: 26}),
		charts.WithYAxisOpts(opts.YAxis{Type: "value", Name: "rescaled (best = 1)", NameLocation: "middle", NameGap: 36, Min: 0, Max: 1}),
	)
	ks := make([]string, len(kc.Rows))
	rec := ""
	for i, r := range kc.Rows {
		ks[i] = fmt.Sprint(r.K)
		if r.Recommended {
			rec = ks[i]
		}
	}
	line.SetXAxis(ks)
	measures := []struct {
		name string
		get  func(KRow) float64
		sym  string
	}{
		{"held-out fit", func(r KRow) float64 { return r.HeldOutLL }, "circle"},
		{"NPMI coherence", func(r KRow) float64 { return r.NPMI }, "rect"},
		{"UMass coherence", func(r KRow) float64 { return r.UMass }, "triangle"},
		{"stability", func(r KRow) float64 { return r.Stability }, "diamond"},
	}
	for mi, m := range measures {
		lo, hi := math.Inf(1), math.Inf(-1)
		for _, r := range kc.Rows {
			lo, hi = math.Min(lo, m.get(r)), math.Max(hi, m.get(r))
		}
		pts := make([]opts.LineData, len(kc.Rows))
		for i, r := range kc.Rows {
			v := 1.0
			if hi > lo {
				v = (m.get(r) - lo) / (hi - lo)
			}
			pts[i] = opts.LineData{Value: math.Round(v*1000) / 1000}
		}
		so := []charts.SeriesOpts{charts.WithLineChartOpts(opts.LineChart{Symbol: m.sym, SymbolSize: 8})}
		if mi == 0 && rec != "" {
			so = append(so,
				charts.WithMarkLineNameXAxisItemOpts(opts.MarkLineNameXAxisItem{Name: "chosen", XAxis: rec}),
				charts.WithMarkLineStyleOpts(opts.MarkLineStyle{Symbol: []string{"none", "none"}, LineStyle: &opts.LineStyle{Color: colAccent, Width: 2, Type: "dashed"}}))
		}
		line.AddSeries(m.name, pts, so...)
	}
	line.Validate()
	return chartSpec{ID: id, Height: 300, Label: "Choosing the number of themes", Option: line.JSON()}
}

// mixRow is one column of the mixture heatmap as its table shows it: label, narratives,
// and the share of each theme row.
type mixRow struct {
	Label, Count string
	Cells        []string
}

// mixtureChart draws Data.Mixture: a column per narrative or group of narratives, a row
// per shown theme, the colour the theme's mean share. Rows of themes not shown (hidden by
// the labels file) are left out. It returns the chart, the row labels and the table rows.
func mixtureChart(d *Data) (chartSpec, []string, []mixRow) {
	id := "uc-chart-mixture"
	label := make(map[int]string, len(d.Themes))
	for _, t := range d.Themes {
		label[t.ID] = t.Label
	}
	var rows []int // indices into Mixture.Themes
	var names, short []string
	for i, t := range d.Mixture.Themes {
		if l, ok := label[t]; ok {
			rows = append(rows, i)
			names = append(names, l)
			short = append(short, shortLabel(l))
		}
	}
	cols := make([]string, len(d.Mixture.Columns))
	// One series per theme row, named by the theme, so that the tooltip names the theme
	// (series), the column (axis) and the share, with no name stored per cell.
	data := make([][]opts.HeatMapData, len(rows))
	var table []mixRow
	var top float64
	for ci, c := range d.Mixture.Columns {
		cols[ci] = c.Label
		r := mixRow{Label: c.Label, Count: c.Count}
		for ri, i := range rows {
			v := pct(c.Shares[i])
			top = math.Max(top, v)
			data[ri] = append(data[ri], opts.HeatMapData{Value: []any{ci, ri, v}})
			r.Cells = append(r.Cells, fmtPct(c.Shares[i]))
		}
		table = append(table, r)
	}
	hm := charts.NewHeatMap()
	hm.SetGlobalOptions(commonOpts(id)...)
	hm.SetGlobalOptions(
		charts.WithTooltipOpts(opts.Tooltip{Show: opts.Bool(true), Trigger: "item"}),
		charts.WithGridOpts(opts.Grid{Left: "8", Right: "16", Top: "10", Bottom: "80", ContainLabel: opts.Bool(true)}),
		charts.WithXAxisOpts(opts.XAxis{Type: "category", Data: cols, Name: "narratives, similar mixtures side by side", NameLocation: "middle", NameGap: 12,
			AxisLabel: &opts.AxisLabel{Show: opts.Bool(false)}, AxisTick: &opts.AxisTick{Show: opts.Bool(false)}}),
		charts.WithYAxisOpts(opts.YAxis{Type: "category", Data: short, Inverse: opts.Bool(true)}),
		charts.WithVisualMapOpts(opts.VisualMap{
			Calculable: opts.Bool(true), Min: 0, Max: float32(math.Ceil(math.Max(top, 1))),
			Orient: "horizontal", Left: "center", Bottom: "0",
			Text:    []string{"larger share", "smaller"},
			InRange: &opts.VisualMapInRange{Color: []string{"#f4f1e8", Palette[2], Palette[5], "#0b2f4f"}},
		}),
	)
	for ri := range rows {
		hm.AddSeries(short[ri]+" (% of the text)", data[ri])
	}
	hm.Validate()
	return chartSpec{ID: id, Height: 120 + 22*len(rows), Label: "How narratives mix the themes", Option: hm.JSON()}, names, table
}
