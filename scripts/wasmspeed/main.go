// Command wasmspeed measures the browser demo in headless Chromium with
// software WebGL: frames/s, model steps/s and model days per second of wall
// time at each grid and steps-per-frame setting, the time from loading the
// page to the first frame, and the WebAssembly program's size. It is run by
// scripts/wasm-speed, which builds the site it serves; it is a measurement,
// not a test, and asserts nothing.
package main

import (
	"bytes"
	"compress/gzip"
	"context"
	"errors"
	"flag"
	"fmt"
	"image"
	"image/png"
	"net"
	"net/http"
	"os"
	"os/exec"
	"path/filepath"
	"sort"
	"time"

	"github.com/chromedp/chromedp"
	"golang.org/x/image/draw"
)

type status struct {
	Day        float64 `json:"day"`
	Steps      int     `json:"steps"`
	Frames     int     `json:"frames"`
	State      string  `json:"state"`
	Grid       string  `json:"grid"`
	Dt         float64 `json:"dt"`
	WorkMs     float64 `json:"workMs"`
	PaintMs    float64 `json:"paintMs"`
	LastError  string  `json:"lastError"`
	Samples    int     `json:"samples"`
	EddyEnergy float64 `json:"eddyEnergy"`
}

type setting struct {
	grid, scheme, steps string
}

func main() {
	site := flag.String("site", "", "the built site to serve")
	seconds := flag.Float64("seconds", 10, "length of each measurement, s of wall time")
	shot := flag.String("shot", "", "save a screenshot of the page to this PNG file")
	sweep := flag.Bool("sweep", false, "also try other steps per frame and the AB3 scheme at 128×64")
	rounds := flag.Int("rounds", 1, "measure each setting this many times, interleaved (the machine's load drifts)")
	flag.Parse()
	if err := run(*site, *seconds, *shot, *sweep, *rounds); err != nil {
		fmt.Fprintln(os.Stderr, "wasmspeed:", err)
		os.Exit(1)
	}
}

func run(site string, seconds float64, shot string, sweep bool, rounds int) error {
	if site == "" {
		return errors.New("-site DIR is required (scripts/wasm-speed builds it)")
	}
	chrome, err := exec.LookPath("chromium")
	if err != nil {
		return errors.New("chromium is not installed (Debian package chromium)")
	}
	wasm, err := os.ReadFile(filepath.Join(site, "wasm", "eddyblock.wasm"))
	if err != nil {
		return err
	}
	var gz bytes.Buffer
	zw, _ := gzip.NewWriterLevel(&gz, gzip.BestCompression)
	zw.Write(wasm)
	zw.Close()

	ln, err := net.Listen("tcp", "127.0.0.1:0")
	if err != nil {
		return err
	}
	srv := &http.Server{Handler: http.FileServer(http.Dir(site))}
	go srv.Serve(ln)
	defer srv.Close()
	base := "http://" + ln.Addr().String() + "/"

	profile, err := os.MkdirTemp("", "wasmspeed-profile-")
	if err != nil {
		return err
	}
	defer os.RemoveAll(profile)
	alloc, cancelAlloc := chromedp.NewExecAllocator(context.Background(),
		chromedp.ExecPath(chrome),
		chromedp.Flag("headless", true),
		chromedp.Flag("no-sandbox", true),
		chromedp.Flag("use-angle", "swiftshader"),
		chromedp.Flag("enable-unsafe-swiftshader", true),
		chromedp.Flag("disable-background-networking", true),
		chromedp.Flag("no-first-run", true),
		chromedp.Flag("disable-component-update", true),
		chromedp.Flag("disable-sync", true),
		chromedp.UserDataDir(profile),
		chromedp.WindowSize(1366, 768),
	)
	defer cancelAlloc()
	ctx, cancel := chromedp.NewContext(alloc)
	defer cancel()

	read := func() (status, error) {
		return chromedp.Run(ctx, chromedp.Evaluate[status](`window.eddyblockStatus || {}`))
	}
	waitFrames := func() error {
		end := time.Now().Add(2 * time.Minute)
		for time.Now().Before(end) {
			if st, err := read(); err == nil && st.Frames > 0 {
				return nil
			}
			time.Sleep(20 * time.Millisecond)
		}
		return errors.New("no frame within 2 minutes")
	}
	set := func(name, value string) error {
		js := fmt.Sprintf(`(() => { const el = document.querySelector('[data-control=%q]'); el.value = %q; el.dispatchEvent(new Event("change")); return document.getElementById("refused").textContent; })()`, name, value)
		msg, err := chromedp.Run(ctx, chromedp.Evaluate[string](js))
		if err == nil && msg != "" {
			err = fmt.Errorf("%s = %s: %s", name, value, msg)
		}
		return err
	}

	// time to the first frame, from the start of the page's navigation
	var firsts []float64
	for range 3 {
		if err := chromedp.Do(ctx, chromedp.Navigate(base+"index.html")); err != nil {
			return err
		}
		if err := waitFrames(); err != nil {
			return err
		}
		ms, err := chromedp.Run(ctx, chromedp.Evaluate[float64](
			`(() => { const f = document.getElementById("model").contentWindow; return f.performance.timeOrigin + f.eddyblock.status().firstFrameAt - performance.timeOrigin; })()`))
		if err != nil {
			return err
		}
		firsts = append(firsts, ms)
	}
	sort.Float64s(firsts)

	settings := []setting{{"64", "rk4", "1"}, {"128", "rk4", "2"}, {"256", "rk4", "4"}}
	if sweep {
		settings = append(settings, setting{"128", "rk4", "1"}, setting{"128", "rk4", "3"}, setting{"128", "ab3", "2"}, setting{"128", "ab3", "4"}, setting{"256", "rk4", "2"}, setting{"256", "ab3", "4"})
	}
	fmt.Printf("WebAssembly program: %.1f MB raw, %.1f MB gzip -9\n", float64(len(wasm))/1e6, float64(gz.Len())/1e6)
	fmt.Printf("first frame after the page starts loading: %.0f ms (median of 3 loads; %.0f–%.0f)\n\n", firsts[1], firsts[0], firsts[2])
	fmt.Println("| grid | scheme, dt | steps/frame | frames/s | steps/s | model days/s | model work/frame | painting |")
	fmt.Println("|---|---|---|---|---|---|---|---|")
	var all []setting
	if seconds <= 0 {
		rounds = -1 // -seconds 0: no measurements (for a screenshot alone)
	}
	for range rounds {
		all = append(all, settings...)
	}
	for _, s := range all {
		if err := chromedp.Do(ctx, chromedp.Navigate(base+"index.html")); err != nil {
			return err
		}
		if err := waitFrames(); err != nil {
			return err
		}
		for _, kv := range [][2]string{{"grid", s.grid}, {"scheme", s.scheme}, {"steps", s.steps}} {
			if err := set(kv[0], kv[1]); err != nil {
				return err
			}
		}
		time.Sleep(4 * time.Second) // the JIT's tiers and the first samples
		a, err := read()
		if err != nil {
			return err
		}
		t0 := time.Now()
		time.Sleep(time.Duration(seconds * float64(time.Second)))
		b, err := read()
		if err != nil {
			return err
		}
		dt := time.Since(t0).Seconds()
		if b.State != "running" {
			return fmt.Errorf("%v: the model is %s: %s", s, b.State, b.LastError)
		}
		fmt.Printf("| %s | %s, %.0f min | %s | %.1f | %.0f | %.2f | %.1f ms | %.1f ms |\n", b.Grid, s.scheme, b.Dt/60, s.steps,
			float64(b.Frames-a.Frames)/dt, float64(b.Steps-a.Steps)/dt, (b.Day-a.Day)/dt, b.WorkMs, b.PaintMs)
	}
	if sweep {
		// the frame rate of the browser alone: an empty page's animation
		// frames, and the demo with its model paused (nothing repainted)
		if err := chromedp.Do(ctx, chromedp.Navigate(base+"index.html")); err != nil {
			return err
		}
		if err := waitFrames(); err != nil {
			return err
		}
		if _, err := chromedp.Run(ctx, chromedp.Evaluate[string](`document.getElementById("model").contentWindow.eddyblock.command("pause")`)); err != nil {
			return err
		}
		time.Sleep(2 * time.Second)
		a, _ := read()
		time.Sleep(5 * time.Second)
		b, _ := read()
		fmt.Printf("\nthe demo paused (nothing repainted): %.1f frames/s\n", float64(b.Frames-a.Frames)/5)
		n, err := chromedp.Run(ctx, chromedp.Evaluate[float64](`new Promise(ok => { let n = 0; const t0 = performance.now(); const f = () => { n++; if (performance.now() - t0 < 3000) requestAnimationFrame(f); else ok(n / 3); }; requestAnimationFrame(f); })`, chromedp.EvalAwaitPromise))
		if err != nil {
			return err
		}
		fmt.Printf("animation frames of the page itself, demo paused: %.1f /s\n", n)
	}
	if shot != "" {
		if err := screenshot(ctx, base, read, shot); err != nil {
			return err
		}
	}
	return nil
}

// screenshot runs the default page for 30 s of wall time, so that the
// running mean has built up, and saves the visible part of the page's main
// column (the pictures, the readouts, the answers) as a PNG, scaled down
// until it is under 150 kB.
func screenshot(ctx context.Context, base string, read func() (status, error), path string) error {
	if err := chromedp.Do(ctx, chromedp.Navigate(base+"index.html")); err != nil {
		return err
	}
	time.Sleep(30 * time.Second)
	if st, err := read(); err != nil || st.State != "running" {
		return fmt.Errorf("screenshot: the model is not running (%v, %v)", st.State, err)
	}
	b, err := chromedp.Run(ctx, chromedp.CaptureScreenshot())
	if err != nil {
		return err
	}
	full, err := png.Decode(bytes.NewReader(b))
	if err != nil {
		return err
	}
	// the page's main column (the pictures, the readouts and the answers),
	// without the controls
	box, err := chromedp.Run(ctx, chromedp.Evaluate[[]float64](`(() => { const r = document.querySelector("main").getBoundingClientRect(); return [r.right + 8, r.bottom + 8]; })()`))
	if err != nil || len(box) != 2 {
		return fmt.Errorf("screenshot: the page's main column: %v", err)
	}
	img := full
	if sub, ok := full.(interface {
		SubImage(image.Rectangle) image.Image
	}); ok {
		img = sub.SubImage(image.Rect(0, 0, int(box[0]), int(box[1])).Intersect(full.Bounds()))
	}
	for scale := 1.0; scale > 0.3; scale -= 0.1 {
		r := img.Bounds()
		w, h := int(float64(r.Dx())*scale), int(float64(r.Dy())*scale)
		dst := image.NewRGBA(image.Rect(0, 0, w, h))
		draw.CatmullRom.Scale(dst, dst.Bounds(), img, r, draw.Src, nil)
		var out bytes.Buffer
		if err := (&png.Encoder{CompressionLevel: png.BestCompression}).Encode(&out, dst); err != nil {
			return err
		}
		if out.Len() <= 150_000 || scale < 0.45 {
			fmt.Printf("\nscreenshot: %s, %d×%d, %d kB\n", path, w, h, out.Len()/1000)
			return os.WriteFile(path, out.Bytes(), 0o644)
		}
	}
	return nil
}
