package main

import (
	"os"
	"time"

	"github.com/mattn/go-isatty"
	"github.com/schollz/progressbar/v3"
)

// progress shows a bar on stderr for steps longer than a couple of seconds. It is silent
// when stderr is not a terminal or when -q was given.
type progress struct {
	bar *progressbar.ProgressBar
}

func stderrIsTerminal(e *env) bool {
	f, ok := e.stderr.(*os.File)
	return ok && (isatty.IsTerminal(f.Fd()) || isatty.IsCygwinTerminal(f.Fd()))
}

// newProgress returns a bar for total steps (0 or less: total unknown until set is called).
func newProgress(e *env, label string, total int) *progress {
	if e.quiet || !stderrIsTerminal(e) {
		return &progress{}
	}
	max := int64(total)
	if max <= 0 {
		max = -1
	}
	bar := progressbar.NewOptions64(max,
		progressbar.OptionSetWriter(e.stderr),
		progressbar.OptionSetDescription(label),
		progressbar.OptionSetVisibility(true),
		progressbar.OptionShowCount(),
		progressbar.OptionSetElapsedTime(true),
		progressbar.OptionSetPredictTime(true),
		progressbar.OptionThrottle(200*time.Millisecond),
		progressbar.OptionClearOnFinish(),
	)
	return &progress{bar: bar}
}

func (p *progress) add(n int) {
	if p.bar != nil {
		p.bar.Add(n)
	}
}

// set reports done of total; usable as a topics.Settings.Progress callback.
func (p *progress) set(done, total int) {
	if p.bar != nil {
		if p.bar.GetMax64() != int64(total) {
			p.bar.ChangeMax(total)
		}
		p.bar.Set(done)
	}
}

func (p *progress) done() {
	if p.bar != nil {
		p.bar.Finish()
		p.bar.Exit()
	}
}
