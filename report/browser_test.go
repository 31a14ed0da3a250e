package report

import (
	"context"
	"fmt"
	"os"
	"path/filepath"
	"slices"
	"strings"
	"sync"
	"testing"
	"time"

	"github.com/chromedp/cdproto/cdp"
	"github.com/chromedp/cdproto/emulation"
	"github.com/chromedp/cdproto/log"
	"github.com/chromedp/cdproto/network"
	"github.com/chromedp/cdproto/runtime"
	"github.com/chromedp/chromedp"
)

// chromiumPath is Debian's chromium package. The browser test needs it and fails (never
// skips) without it: install with `apt-get install chromium` as root.
const chromiumPath = "/usr/bin/chromium"

// pageEvents collects what the browser reports while the page runs.
type pageEvents struct {
	mu       sync.Mutex
	console  []string // console errors and warnings, exceptions, browser log errors
	requests []string // URLs of every request the page attempted
}

func (e *pageEvents) listen(ev any) {
	e.mu.Lock()
	defer e.mu.Unlock()
	switch ev := ev.(type) {
	case *runtime.EventConsoleAPICalled:
		if ev.Type == "error" || ev.Type == "warning" || ev.Type == "assert" {
			var parts []string
			for _, a := range ev.Args {
				parts = append(parts, string(a.Value)+a.Description)
			}
			e.console = append(e.console, fmt.Sprintf("console.%s: %s", ev.Type, strings.Join(parts, " ")))
		}
	case *runtime.EventExceptionThrown:
		msg := ev.ExceptionDetails.Text
		if ev.ExceptionDetails.Exception != nil {
			msg += " " + ev.ExceptionDetails.Exception.Description
		}
		e.console = append(e.console, "exception: "+msg)
	case *log.EventEntryAdded:
		if ev.Entry.Level == "error" || ev.Entry.Level == "warning" {
			e.console = append(e.console, fmt.Sprintf("log %s (%s): %s %s", ev.Entry.Level, ev.Entry.Source, ev.Entry.Text, ev.Entry.URL))
		}
	case *network.EventRequestWillBeSent:
		e.requests = append(e.requests, ev.Request.URL)
	}
}

func (e *pageEvents) snapshot() (console, requests []string) {
	e.mu.Lock()
	defer e.mu.Unlock()
	return append([]string(nil), e.console...), append([]string(nil), e.requests...)
}

// newBrowser starts headless chromium with a fresh profile and no background
// networking, and returns a tab context whose events go to ev.
func newBrowser(tb testing.TB, ev *pageEvents) context.Context {
	tb.Helper()
	if _, err := os.Stat(chromiumPath); err != nil {
		tb.Fatalf("the browser test needs Debian's chromium at %s (apt-get install chromium, as root): %v", chromiumPath, err)
	}
	profile := tb.TempDir()
	alloc, cancelAlloc := chromedp.NewExecAllocator(context.Background(),
		chromedp.ExecPath(chromiumPath),
		chromedp.Flag("headless", true),
		chromedp.Flag("no-sandbox", true),
		chromedp.Flag("disable-gpu", true),
		chromedp.Flag("disable-quic", true),
		chromedp.Flag("no-first-run", true),
		chromedp.Flag("disable-background-networking", true),
		chromedp.Flag("disable-component-update", true),
		chromedp.Flag("disable-sync", true),
		chromedp.Flag("disable-dev-shm-usage", true),
		chromedp.Flag("hide-scrollbars", true),
		chromedp.UserDataDir(profile),
		chromedp.WindowSize(1280, 900),
	)
	ctx, cancel := chromedp.NewContext(alloc, chromedp.WithListener(ev.listen))
	tb.Cleanup(func() { cancel(); cancelAlloc() })
	if err := chromedp.Do(ctx); err != nil { // start the browser
		tb.Fatalf("starting %s: %v", chromiumPath, err)
	}
	return ctx
}

// chartCheck is what the page reports about one chart container.
type chartCheck struct {
	ID       string `json:"id"`
	Width    int    `json:"w"`
	Height   int    `json:"h"`
	Canvases int    `json:"canvases"`
	Painted  int    `json:"painted"` // sampled pixels that are not transparent
	DataURL  int    `json:"dataURL"` // length of the canvas's PNG data URL
}

// chartsScript measures every chart container: a canvas of non-zero size with painted
// pixels (sampled every 4th pixel of every 4th row).
const chartsScript = `Array.from(document.querySelectorAll('.uc-chart')).map(function (el) {
  var cs = el.querySelectorAll('canvas');
  var r = {id: el.id, w: 0, h: 0, canvases: cs.length, painted: 0, dataURL: 0};
  if (cs.length === 0) { return r; }
  var c = cs[0];
  r.w = c.width; r.h = c.height;
  if (c.width === 0 || c.height === 0) { return r; }
  var px = c.getContext('2d').getImageData(0, 0, c.width, c.height).data;
  for (var y = 0; y < c.height; y += 4) {
    for (var x = 0; x < c.width; x += 4) {
      if (px[(y * c.width + x) * 4 + 3] !== 0) { r.painted++; }
    }
  }
  r.dataURL = c.toDataURL('image/png').length;
  return r;
})`

// loadReport writes the report for d, opens it and waits until the charts are drawn. It
// returns the path and the time from navigation start to the end of drawing.
func loadReport(tb testing.TB, ctx context.Context, d *Data, name string) (string, time.Duration) {
	tb.Helper()
	path := filepath.Join(tb.TempDir(), name)
	if err := WriteFile(path, d); err != nil {
		tb.Fatal(err)
	}
	if err := chromedp.Do(ctx, chromedp.Navigate("file://"+path)); err != nil {
		tb.Fatalf("opening %s: %v", path, err)
	}
	wait, cancel := context.WithTimeout(ctx, 45*time.Second)
	defer cancel()
	// Wait for the script to finish and for one more frame to be painted.
	ms, err := chromedp.Run(wait, chromedp.Evaluate[float64](`new Promise(function (ok) {
	  function check() {
	    if (window.__ucChartsDrawn !== undefined) {
	      requestAnimationFrame(function () { requestAnimationFrame(function () { ok(performance.now()); }); });
	    } else { setTimeout(check, 10); }
	  }
	  check();
	})`, chromedp.EvalAwaitPromise))
	if err != nil {
		tb.Fatalf("waiting for the charts of %s: %v", path, err)
	}
	return path, time.Duration(ms * float64(time.Millisecond))
}

// searchExpect is the oracle for the search box: the themes whose header text (label,
// words, description, note) or one of whose examples contains q, case-insensitively.
func searchExpect(d *Data, q string) int {
	q = strings.ToLower(q)
	n := 0
	for _, t := range d.Themes {
		text := strings.Join([]string{t.Label, t.Description, t.Note, strings.Join(t.TopWords, " "), strings.Join(t.DistinctiveWords, " "), strings.Join(t.RelevantWords, " ")}, " ")
		for _, e := range t.Examples[:min(5, len(t.Examples))] {
			text += " " + plainText(e.Segments)
		}
		if strings.Contains(strings.ToLower(text), q) {
			n++
		}
	}
	return n
}

func TestBrowser(t *testing.T) {
	start := time.Now()
	var ev pageEvents
	ctx := newBrowser(t, &ev)
	d := Sample(SampleSettings{Hostile: true, Seed: 7, Themes: 8})
	path, drawTime := loadReport(t, ctx, d, "sample-report.html")
	jsMillis, err := chromedp.Run(ctx, chromedp.Evaluate[float64]("window.__ucDrawMillis"))
	if err != nil {
		t.Fatal(err)
	}
	t.Logf("report %s drawn %v after navigation start (charts: %.0f ms)", path, drawTime, jsMillis)

	// Every chart drawn: a canvas with non-zero size and painted pixels.
	checks, err := chromedp.Run(ctx, chromedp.Evaluate[[]chartCheck](chartsScript))
	if err != nil {
		t.Fatal(err)
	}
	wantCharts := 1 + len(d.Themes) + 4 // sizes, a trend per theme, tree, mixture, heatmap, K
	if len(checks) != wantCharts {
		t.Errorf("%d chart containers, want %d", len(checks), wantCharts)
	}
	for _, c := range checks {
		if c.Canvases == 0 || c.Width == 0 || c.Height == 0 || c.Painted < 50 || c.DataURL < 2000 {
			t.Errorf("chart %s not drawn: %+v", c.ID, c)
		}
	}
	// Every sparkline and every group interval has drawn lines.
	sparks, err := chromedp.Run(ctx, chromedp.Evaluate[[]float64](`Array.from(document.querySelectorAll('svg.uc-spark, svg.uc-whisker')).map(function (s) {
	  var w = 0; s.querySelectorAll('polyline, circle').forEach(function (p) { w += p.getBBox().width; }); return w; })`))
	if err != nil {
		t.Fatal(err)
	}
	if len(sparks) == 0 {
		t.Error("no sparklines")
	}
	for i, w := range sparks {
		if w <= 0 {
			t.Errorf("sparkline %d is empty", i)
		}
	}

	// The payloads show as text and run nothing.
	type xss struct {
		Pwned   string `json:"pwned"`
		Imgs    int    `json:"imgs"`
		Scripts int    `json:"scripts"`
		Text    string `json:"text"`
	}
	x, err := chromedp.Run(ctx, chromedp.Evaluate[xss](`({pwned: typeof window.__pwned, imgs: document.images.length,
	  scripts: document.scripts.length, text: document.body.innerText})`))
	if err != nil {
		t.Fatal(err)
	}
	if x.Pwned != "undefined" {
		t.Errorf("window.__pwned is %s: a payload ran", x.Pwned)
	}
	if x.Imgs != 0 || x.Scripts != 3 {
		t.Errorf("page has %d img and %d script elements, want 0 and 3 (runtime, our script, the JSON block)", x.Imgs, x.Scripts)
	}
	for _, p := range []string{HostileScript, HostileImg} {
		if n := strings.Count(x.Text, p); n < 2 { // the label (twice at least) and the example
			t.Errorf("payload %q visible %d times as text, want at least 2", p, n)
		}
	}

	// Tooltips (HTML drawn by echarts) show the payload label as text too: show the
	// tooltip of every data item named with it, in every chart.
	tips, err := chromedp.Run(ctx, chromedp.Evaluate[int](`(function () {
	  var shown = 0;
	  document.querySelectorAll('.uc-chart').forEach(function (el) {
	    var c = echarts.getInstanceByDom(el), o = c.getOption();
	    o.series.forEach(function (s, si) {
	      (s.data || []).forEach(function (d, di) {
	        if (d && typeof d.name === 'string' && d.name.indexOf('<') >= 0) { c.dispatchAction({type: 'showTip', seriesIndex: si, dataIndex: di}); shown++; }
	      });
	    });
	    var cats = [].concat(o.yAxis || []).concat(o.xAxis || []);
	    cats.forEach(function (ax) {
	      (ax.data || []).forEach(function (name, di) {
	        if (typeof name === 'string' && name.indexOf('<') >= 0) { c.dispatchAction({type: 'showTip', seriesIndex: 0, dataIndex: di}); shown++; }
	      });
	    });
	  });
	  return shown;
	})()`))
	if err != nil {
		t.Fatal(err)
	}
	if tips < 4 {
		t.Errorf("showed %d tooltips with the payload label, want at least 4 (sizes, tree, mixture, heatmap)", tips)
	}
	x2, err := chromedp.Run(ctx, chromedp.Evaluate[xss](`({pwned: typeof window.__pwned, imgs: document.images.length, scripts: document.scripts.length, text: ''})`))
	if err != nil {
		t.Fatal(err)
	}
	if x2.Pwned != "undefined" || x2.Imgs != 0 || x2.Scripts != 3 {
		t.Errorf("after tooltips: __pwned %s, %d img, %d script elements", x2.Pwned, x2.Imgs, x2.Scripts)
	}

	// Screenshots: the first screen and one theme section.
	dir := artifactDir(t)
	shot, err := chromedp.Run(ctx, chromedp.CaptureScreenshot())
	if err != nil {
		t.Fatal(err)
	}
	writeArtifact(t, dir, "report-first-screen.png", shot)
	third := fmt.Sprintf("#theme-%d", d.Themes[2].ID)
	shot, err = chromedp.Run(ctx, chromedp.Screenshot(chromedp.CSS(third)))
	if err != nil {
		t.Fatal(err)
	}
	writeArtifact(t, dir, "report-theme-section.png", shot)
	// The repeated-text section lists every group and shows one narrative of each.
	nCopies, err := chromedp.Run(ctx, chromedp.Evaluate[[]int](`[document.querySelectorAll('#uc-copies tbody tr').length,
	  document.querySelectorAll('#repeated-text .uc-copy').length]`))
	if err != nil {
		t.Fatal(err)
	}
	if len(nCopies) != 2 || nCopies[0] != len(d.Copies.Listed) || nCopies[1] != len(d.Copies.Listed) {
		t.Errorf("repeated text: %v table rows and examples, want %d of each", nCopies, len(d.Copies.Listed))
	}
	for _, sec := range []string{"how-related", "repeated-text"} {
		shot, err = chromedp.Run(ctx, chromedp.Screenshot(chromedp.CSS("#"+sec)))
		if err != nil {
			t.Fatal(err)
		}
		writeArtifact(t, dir, "report-"+sec+".png", shot)
	}

	// The search box filters themes and examples.
	visible := `({themes: Array.from(document.querySelectorAll('.uc-theme')).filter(function (e) { return e.offsetParent !== null; }).length,
	  examples: Array.from(document.querySelectorAll('.uc-example')).filter(function (e) { return e.offsetParent !== null; }).length,
	  rows: Array.from(document.querySelectorAll('#uc-glance tbody tr')).filter(function (e) { return e.offsetParent !== null; }).length,
	  count: document.getElementById('uc-search-count').textContent})`
	type vis struct {
		Themes, Examples, Rows int
		Count                  string
	}
	for _, q := range []string{"driveway", "Tollgate", "no such word anywhere"} {
		if err := chromedp.Do(ctx,
			chromedp.Evaluate[chromedp.Void](`(function(){ var i = document.getElementById('uc-search'); i.value = ''; i.dispatchEvent(new Event('input')); })()`),
			chromedp.SendKeys(chromedp.CSS("#uc-search"), q)); err != nil {
			t.Fatal(err)
		}
		v, err := chromedp.Run(ctx, chromedp.Evaluate[vis](visible))
		if err != nil {
			t.Fatal(err)
		}
		want := searchExpect(d, q)
		if v.Themes != want || v.Rows != want {
			t.Errorf("search %q: %d themes and %d overview rows shown, want %d", q, v.Themes, v.Rows, want)
		}
		if want == len(d.Themes) || (q == "driveway" && want == 0) {
			t.Errorf("search %q does not narrow the sample (%d of %d): pick another word", q, want, len(d.Themes))
		}
		if !strings.HasPrefix(v.Count, fmt.Sprintf("%d of %d", want, len(d.Themes))) {
			t.Errorf("search %q: counter says %q", q, v.Count)
		}
		t.Logf("search %q: %d themes, %d examples shown", q, v.Themes, v.Examples)
	}

	// The overview table sorts: the second click on "share of text" sorts it downwards.
	shares, err := chromedp.Run(ctx, chromedp.Evaluate[[]float64](`(function () {
	  var b = document.querySelector('#uc-glance button[data-col="3"]'); b.click(); b.click();
	  return Array.from(document.querySelectorAll('#uc-glance tbody tr')).map(function (r) { return parseFloat(r.cells[3].getAttribute('data-v')); });
	})()`))
	if err != nil {
		t.Fatal(err)
	}
	if len(shares) != len(d.Themes) {
		t.Errorf("%d rows after sorting, want %d", len(shares), len(d.Themes))
	}
	for i := 1; i < len(shares); i++ {
		if shares[i] > shares[i-1] {
			t.Errorf("not sorted downwards by share: %v", shares)
			break
		}
	}

	// The print stylesheet hides the search bar and starts each theme on a new page.
	media := func(m string) chromedp.Action[chromedp.Void] {
		return chromedp.Func(func(ctx context.Context, tg *chromedp.Target) error {
			_, err := cdp.Call(ctx, tg, emulation.SetEmulatedMedia, emulation.SetEmulatedMediaParams{Media: m})
			return err
		})
	}
	if err := chromedp.Do(ctx, media("print")); err != nil {
		t.Fatal(err)
	}
	pr, err := chromedp.Run(ctx, chromedp.Evaluate[[]string](`[getComputedStyle(document.querySelector('.uc-searchbar')).display,
	  getComputedStyle(document.querySelector('.uc-theme')).breakBefore]`))
	if err != nil {
		t.Fatal(err)
	}
	if len(pr) != 2 || pr[0] != "none" || pr[1] != "page" {
		t.Errorf("print media: search bar display and theme break-before = %v, want [none page]", pr)
	}
	if err := chromedp.Do(ctx, media("")); err != nil {
		t.Fatal(err)
	}

	console, requests := ev.snapshot()
	for _, c := range console {
		t.Errorf("browser console: %s", c)
	}
	for _, u := range requests {
		if !strings.HasPrefix(u, "file://") && !strings.HasPrefix(u, "data:") {
			t.Errorf("page attempted a network request: %s", u)
		}
	}
	if len(requests) == 0 {
		t.Error("no request seen at all: the network listener is not working")
	}
	t.Logf("requests: %v; browser test took %v", requests, time.Since(start))

	// Negative control: the listeners do see a page that tries the network, with and
	// without a CSP that blocks it. 192.0.2.1 is TEST-NET-1 (RFC 5737): never routed.
	canary := filepath.Join(t.TempDir(), "canary.html")
	page := `<!DOCTYPE html><html><head><meta charset="utf-8"><meta http-equiv="Content-Security-Policy" content="img-src data:"></head>` +
		`<body><img src="http://192.0.2.1/blocked.png"><script>console.error("canary")</script></body></html>`
	if err := os.WriteFile(canary, []byte(page), 0o644); err != nil {
		t.Fatal(err)
	}
	if err := chromedp.Do(ctx, chromedp.Navigate("file://"+canary)); err != nil {
		t.Fatal(err)
	}
	deadline := time.Now().Add(10 * time.Second)
	for {
		console, _ = ev.snapshot()
		var sawCSP, sawError bool
		for _, c := range console {
			sawCSP = sawCSP || strings.Contains(c, "192.0.2.1")
			sawError = sawError || strings.Contains(c, "canary")
		}
		if sawCSP && sawError {
			break
		}
		if time.Now().After(deadline) {
			t.Fatalf("negative control: the listeners missed the blocked request or the console error: %q", console)
		}
		time.Sleep(50 * time.Millisecond)
	}
	openPage := filepath.Join(t.TempDir(), "canary-open.html")
	if err := os.WriteFile(openPage, []byte(`<!DOCTYPE html><img src="http://192.0.2.1/open.png">`), 0o644); err != nil {
		t.Fatal(err)
	}
	if err := chromedp.Do(ctx, chromedp.Navigate("file://"+openPage)); err != nil {
		t.Fatal(err)
	}
	for deadline = time.Now().Add(10 * time.Second); ; time.Sleep(50 * time.Millisecond) {
		_, requests = ev.snapshot()
		if slices.Contains(requests, "http://192.0.2.1/open.png") {
			break
		}
		if time.Now().After(deadline) {
			t.Fatalf("negative control: the network listener missed a request: %q", requests)
		}
	}
}

func writeArtifact(tb testing.TB, dir, name string, b []byte) {
	tb.Helper()
	p := filepath.Join(dir, name)
	if err := os.WriteFile(p, b, 0o644); err != nil {
		tb.Fatal(err)
	}
	tb.Logf("artifact: %s (%d bytes)", p, len(b))
}
