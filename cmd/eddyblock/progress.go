package main

import (
	"fmt"
	"io"
	"os"
	"time"

	"github.com/schollz/progressbar/v3"
	"golang.org/x/term"

	"github.com/eddyblock/eddyblock/experiment"
)

// progress shows a run's progress: on a terminal, a bar with the model day,
// steps per second and the time left, the periodic progress lines printed
// above it; otherwise (a file, a pipe, a batch job's log) the periodic
// lines alone. -quiet shows neither.
type progress struct {
	w     io.Writer
	quiet bool
	tty   bool
	bar   *progressbar.ProgressBar
	e     *experiment.Experiment
	start time.Time
	step0 int
}

func newProgress(w io.Writer, quiet bool) *progress {
	p := &progress{w: w, quiet: quiet}
	if f, ok := w.(*os.File); ok && term.IsTerminal(int(f.Fd())) {
		p.tty = true
	}
	return p
}

// begin is called before the first step.
func (p *progress) begin(e *experiment.Experiment) {
	p.e, p.start, p.step0 = e, time.Now(), e.Model.Steps()
	if p.quiet {
		return
	}
	fmt.Fprintln(p.w, experiment.ProgressUnits)
	if p.tty {
		p.bar = progressbar.NewOptions(e.TotalSteps()-p.step0,
			progressbar.OptionSetWriter(p.w),
			progressbar.OptionSetWidth(30),
			progressbar.OptionSetPredictTime(true),
			progressbar.OptionShowDescriptionAtLineEnd(),
			progressbar.OptionThrottle(200*time.Millisecond),
			progressbar.OptionClearOnFinish(),
		)
	}
}

// step is called after every step.
func (p *progress) step(e *experiment.Experiment) {
	if p.bar == nil {
		return
	}
	n := e.Model.Steps() - p.step0
	rate := float64(n) / time.Since(p.start).Seconds()
	p.bar.Describe(fmt.Sprintf("day %.1f of %g, %.0f steps/s", e.Model.Time()/86400, e.Config.Run.Days, rate))
	p.bar.Set(n)
}

// report prints a progress line (above the bar on a terminal).
func (p *progress) report(pr experiment.Progress) {
	if p.quiet {
		return
	}
	if p.bar != nil {
		p.bar.Clear()
	}
	fmt.Fprintln(p.w, pr)
}

// end removes the bar.
func (p *progress) end() {
	if p.bar != nil {
		p.bar.Finish()
		p.bar.Clear()
	}
}
