package main

import (
	"bytes"
	"context"
	"fmt"
	"image"
	"image/png"
	"os"
	"path/filepath"
	"strings"
	"sync"
	"testing"
	"time"

	"github.com/chromedp/chromedp"

	"github.com/eddyblock/eddyblock/internal/testenv"
)

// chromiumFlags start Debian's Chromium headless with software WebGL
// (SwiftShader through ANGLE: no GPU) and nothing that talks to the network.
func chromiumFlags(path, profile string) []chromedp.ExecAllocatorOption {
	return []chromedp.ExecAllocatorOption{
		chromedp.ExecPath(path),
		chromedp.Flag("headless", true),
		chromedp.Flag("no-sandbox", true),
		chromedp.Flag("use-angle", "swiftshader"),
		chromedp.Flag("enable-unsafe-swiftshader", true),
		chromedp.Flag("disable-background-networking", true),
		chromedp.Flag("no-first-run", true),
		chromedp.Flag("disable-component-update", true),
		chromedp.Flag("disable-sync", true),
		chromedp.Flag("disable-background-timer-throttling", true),
		chromedp.Flag("disable-renderer-backgrounding", true),
		chromedp.UserDataDir(profile),
		chromedp.WindowSize(1366, 900),
	}
}

// artifactDir is where the test's screenshots go: $EDDYBLOCK_ARTIFACTS if
// set, else a temporary directory of the test.
func artifactDir(t *testing.T) string {
	if d := os.Getenv("EDDYBLOCK_ARTIFACTS"); d != "" {
		if err := os.MkdirAll(d, 0o755); err != nil {
			t.Fatal(err)
		}
		return d
	}
	return t.TempDir()
}

// browserStatus is the part of the page's status object the test reads.
type browserStatus struct {
	Day            float64           `json:"day"`
	EddyEnergy     float64           `json:"eddyEnergy"`
	State          string            `json:"state"`
	Failure        string            `json:"failure"`
	LastError      string            `json:"lastError"`
	FPS            float64           `json:"fps"`
	StepsPerSecond float64           `json:"stepsPerSecond"`
	DaysPerSecond  float64           `json:"daysPerSecond"`
	Frames         int               `json:"frames"`
	Samples        int               `json:"samples"`
	Scenario       string            `json:"scenario"`
	Grid           string            `json:"grid"`
	Settings       map[string]string `json:"settings"`
	Text           map[string]string `json:"text"`
}

// TestBrowserDemo drives the demo in headless Chromium as a user would:
// the page loads without console errors or exceptions; the model's picture
// is not blank and changes; the model day advances; the E-vectors switched
// on draw arrows over the running mean with their legend; with the source's
// strength at zero the eddy energy decays; a scenario switch empties the
// running mean; a refused value shows the library's error while the model
// runs on; a forced blow-up stops the model with its message.
func TestBrowserDemo(t *testing.T) {
	chrome := testenv.Tool(t, "chromium", "Debian package chromium")
	testenv.Long(t) // half a minute to a few minutes of wall time
	base := startServe(t)
	art := artifactDir(t)
	t.Logf("screenshots in %s", art)

	alloc, cancelAlloc := chromedp.NewExecAllocator(context.Background(), chromiumFlags(chrome, t.TempDir())...)
	defer cancelAlloc()
	ctx, cancel := chromedp.NewContext(alloc)
	defer cancel()

	// every console message, from the start
	var mu sync.Mutex
	var bad []string
	msgs := chromedp.Console(ctx)
	go func() {
		for m, err := range msgs {
			if err != nil {
				return
			}
			if m.Type == chromedp.ConsoleError || m.Type == chromedp.ConsoleException {
				mu.Lock()
				bad = append(bad, fmt.Sprintf("%s: %s (%s:%d)", m.Type, m.Text, m.URL, m.Line))
				mu.Unlock()
			}
		}
	}()
	checkConsole := func(when string) {
		t.Helper()
		mu.Lock()
		defer mu.Unlock()
		if len(bad) > 0 {
			t.Fatalf("%s: console errors or exceptions:\n%s", when, strings.Join(bad, "\n"))
		}
	}
	run := func(what string, a chromedp.Action[chromedp.Void]) {
		t.Helper()
		if err := chromedp.Do(ctx, a); err != nil {
			t.Fatalf("%s: %v", what, err)
		}
	}
	status := func() browserStatus {
		t.Helper()
		st, err := chromedp.Run(ctx, chromedp.Evaluate[browserStatus](`window.eddyblockStatus || {}`))
		if err != nil {
			t.Fatalf("reading the status: %v", err)
		}
		return st
	}
	// wait polls the status object until cond holds, within limit of wall time
	wait := func(what string, limit time.Duration, cond func(browserStatus) bool) browserStatus {
		t.Helper()
		end := time.Now().Add(limit)
		for {
			st := status()
			if cond(st) {
				return st
			}
			if time.Now().After(end) {
				t.Fatalf("waiting %v for %s: status %+v", limit, what, st)
			}
			time.Sleep(100 * time.Millisecond)
		}
	}
	// set changes a control as a user does, and returns the page's message
	// about refused values
	set := func(name, value string) string {
		t.Helper()
		js := fmt.Sprintf(`(() => { const el = document.querySelector('[data-control=%q]'); el.value = %q; el.dispatchEvent(new Event("change")); return document.getElementById("refused").textContent; })()`, name, value)
		msg, err := chromedp.Run(ctx, chromedp.Evaluate[string](js))
		if err != nil {
			t.Fatalf("setting %s = %s: %v", name, value, err)
		}
		return msg
	}
	shot := func(name string) image.Image {
		t.Helper()
		b, err := chromedp.Run(ctx, chromedp.Screenshot(chromedp.ID("model")))
		if err != nil {
			t.Fatalf("screenshot: %v", err)
		}
		if err := os.WriteFile(filepath.Join(art, name), b, 0o644); err != nil {
			t.Fatal(err)
		}
		img, err := png.Decode(bytes.NewReader(b))
		if err != nil {
			t.Fatalf("screenshot %s: %v", name, err)
		}
		return img
	}

	start := time.Now()
	run("loading the page", chromedp.Navigate(base))
	st := wait("the first frames", 2*time.Minute, func(s browserStatus) bool { return s.Frames > 10 })
	t.Logf("first status with frames %v after navigation: %+v", time.Since(start), st)
	checkConsole("after loading")

	// not blank, and changing: distinct colours of the model's picture
	// (the signed scale has 257 entries; shading and outlines add more)
	a := shot("browser-1.png")
	if n := distinctColours(a); n < 200 {
		t.Errorf("the model's picture has %d distinct colours: blank or nearly so", n)
	}
	d0 := status().Day
	time.Sleep(2 * time.Second)
	b := shot("browser-2.png")
	if f := changedFraction(a, b); f < 0.005 {
		t.Errorf("the picture did not change in 2 s (%.3f %% of pixels changed)", 100*f)
	}
	if d1 := status().Day; !(d1 > d0) {
		t.Errorf("the model day did not advance in 2 s: %g then %g", d0, d1)
	}

	// the coarse grid, so that the rest takes less wall time
	if msg := set("grid", "64"); msg != "" {
		t.Fatalf("grid 64: %s", msg)
	}
	wait("the 64×32 grid", 30*time.Second, func(s browserStatus) bool { return s.Grid == "64×32" })
	st = wait("day 12", 5*time.Minute, func(s browserStatus) bool { return s.Day >= 12 })
	e0, day0 := st.EddyEnergy, st.Day
	if !(e0 > 0) {
		t.Fatalf("no eddy energy at day %g: %g", st.Day, e0)
	}
	// E-vectors over the running mean: the legend gives their scale and
	// near-black arrow ink appears in the running mean's half of the picture
	before := darkPixels(shot("browser-no-arrows.png"), true)
	if msg := set("arrows", "evec"); msg != "" {
		t.Fatalf("arrows on: %s", msg)
	}
	st = wait("the arrows' legend", 30*time.Second, func(s browserStatus) bool {
		return strings.Contains(s.Text["arrows"], "longest arrow")
	})
	time.Sleep(time.Second)
	after := darkPixels(shot("browser-arrows.png"), true)
	t.Logf("arrows: %q; near-black pixels in the right half %d without, %d with", st.Text["arrows"], before, after)
	if after < before+50 || after < 2*before {
		t.Errorf("with the E-vectors on, the running mean's half has %d near-black pixels, %d without: no arrows drawn", after, before)
	}
	checkConsole("with the arrows on")

	if msg := set("train_amplitude", "0"); msg != "" {
		t.Fatalf("strength 0: %s", msg)
	}
	if s := status(); s.Settings["source"] != "none" {
		t.Errorf("with strength 0 the source is %q, want it off", s.Settings["source"])
	}
	st = wait("ten more model days", 5*time.Minute, func(s browserStatus) bool { return s.Day >= day0+10 })
	t.Logf("eddy energy %.4g m² s⁻² at day %.1f with the source stopped, %.4g at day %.1f", e0, day0, st.EddyEnergy, st.Day)
	if !(st.EddyEnergy < 0.5*e0) {
		t.Errorf("eddy energy %g ten days after the source stopped, %g when it stopped: not decaying", st.EddyEnergy, e0)
	}

	// a scenario switch empties the running mean
	if st.Samples == 0 {
		t.Fatalf("degenerate test: no samples in the running mean at day %g", st.Day)
	}
	if msg := set("scenario", "storm-track-ending-at-block"); msg != "" {
		t.Fatalf("scenario switch: %s", msg)
	}
	st = status()
	if st.Scenario != "storm-track-ending-at-block" || st.Samples != 0 || st.Day > 1 {
		t.Errorf("after the scenario switch: scenario %q, %d samples, day %g; want an empty mean from day 0", st.Scenario, st.Samples, st.Day)
	}

	// a refused value: the library's error on the page, the model running on
	msg := set("noise_rate", "-1")
	if !strings.Contains(msg, "wavemaker.injection_rate") {
		t.Errorf("a negative injection rate: the page says %q, want the library's error naming wavemaker.injection_rate", msg)
	}
	st = status()
	if !strings.Contains(st.LastError, "wavemaker.injection_rate") || st.Settings["noise_rate"] != "10" || st.State != "running" {
		t.Errorf("after the refused value: lastError %q, noise_rate %q, state %q", st.LastError, st.Settings["noise_rate"], st.State)
	}
	dRef := st.Day
	wait("the model to run on", time.Minute, func(s browserStatus) bool { return s.Day > dRef+0.5 })

	// a forced blow-up stops the model and says why
	if msg := set("noise_rate", "1e7"); msg != "" {
		t.Fatalf("a huge injection rate was refused (%s); it should be accepted and blow up", msg)
	}
	st = wait("the model to stop", 2*time.Minute, func(s browserStatus) bool { return s.State == "stopped" })
	alert, err := chromedp.Run(ctx, chromedp.Evaluate[string](`document.getElementById("alerts").textContent`))
	if err != nil {
		t.Fatal(err)
	}
	if st.Failure == "" || !strings.Contains(alert, "The model stopped") || !strings.Contains(alert, st.Failure) {
		t.Errorf("after the blow-up: failure %q, page alert %q", st.Failure, alert)
	}
	dStop := st.Day
	time.Sleep(time.Second)
	if s := status(); s.Day != dStop {
		t.Errorf("the stopped model advanced from day %g to %g", dStop, s.Day)
	}
	page, err := chromedp.Run(ctx, chromedp.FullScreenshot(100))
	if err == nil {
		err = os.WriteFile(filepath.Join(art, "browser-stopped-page.png"), page, 0o644)
	}
	if err != nil {
		t.Errorf("page screenshot: %v", err)
	}
	checkConsole("at the end")
	t.Logf("browser test took %v", time.Since(start))
}

// distinctColours counts the distinct RGB colours of an image.
func distinctColours(img image.Image) int {
	seen := map[[3]uint32]bool{}
	b := img.Bounds()
	for y := b.Min.Y; y < b.Max.Y; y++ {
		for x := b.Min.X; x < b.Max.X; x++ {
			r, g, bl, _ := img.At(x, y).RGBA()
			seen[[3]uint32{r >> 8, g >> 8, bl >> 8}] = true
		}
	}
	return len(seen)
}

// darkPixels counts the near-black pixels (every channel under 32: the
// arrows' ink, not the block's grey outline) of an image, or of its right
// half.
func darkPixels(img image.Image, rightHalf bool) int {
	b := img.Bounds()
	x0 := b.Min.X
	if rightHalf {
		x0 = (b.Min.X + b.Max.X) / 2
	}
	n := 0
	for y := b.Min.Y; y < b.Max.Y; y++ {
		for x := x0; x < b.Max.X; x++ {
			r, g, bl, _ := img.At(x, y).RGBA()
			if r>>8 < 32 && g>>8 < 32 && bl>>8 < 32 {
				n++
			}
		}
	}
	return n
}

// changedFraction is the fraction of pixels whose colour differs.
func changedFraction(a, b image.Image) float64 {
	ba := a.Bounds()
	if ba != b.Bounds() || ba.Empty() {
		return 1
	}
	n := 0
	for y := ba.Min.Y; y < ba.Max.Y; y++ {
		for x := ba.Min.X; x < ba.Max.X; x++ {
			r1, g1, b1, _ := a.At(x, y).RGBA()
			r2, g2, b2, _ := b.At(x, y).RGBA()
			if r1 != r2 || g1 != g2 || b1 != b2 {
				n++
			}
		}
	}
	return float64(n) / float64(ba.Dx()*ba.Dy())
}
