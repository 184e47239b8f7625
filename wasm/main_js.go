//go:build js && wasm

package main

import (
	"encoding/json"
	"fmt"
	"image/color"
	"math"
	"sync"
	"syscall/js"
	"time"

	"github.com/hajimehoshi/ebiten/v2"
	"github.com/hajimehoshi/ebiten/v2/inpututil"
)

// maxPixels bounds the picture's size in device pixels: a larger canvas
// is drawn at a lower resolution and scaled up, so that a big screen does
// not cost the model its frame budget.
const maxPixels = 1600 * 600

// game is the ebiten game around an App. The page's calls (set, command,
// status) and ebiten's Update and Draw take turns through mu.
type game struct {
	mu  sync.Mutex
	app *App
	pt  painter

	field    [2]*ebiten.Image // the live field and the running mean, FieldSize
	fieldPix []byte
	fw, fh   int
	overlay  *ebiten.Image // the picture's size
	ovPix    []byte
	w, h     int
	drawn    [4]int // the versions on the images: live, mean, overlay, arrows
	op       ebiten.DrawImageOptions
	ovPanel  [2]*ebiten.Image // the overlay's part over each panel
	vectors  *ebiten.Image    // the arrows over the running mean, the panel's size
	vecPix   []byte
	first    float64 // the page clock (performance.now, ms) at the first frame
}

// Update does one frame's work: keyboard shortcuts, then the App's frame.
func (g *game) Update() error {
	var cmd string
	switch {
	case inpututil.IsKeyJustPressed(ebiten.KeySpace):
		cmd = "toggle"
	case inpututil.IsKeyJustPressed(ebiten.KeyPeriod):
		cmd = "step"
	case inpututil.IsKeyJustPressed(ebiten.KeyR):
		cmd = "reset"
	case inpututil.IsKeyJustPressed(ebiten.KeyC):
		cmd = "clear"
	}
	g.mu.Lock()
	defer g.mu.Unlock()
	if cmd != "" {
		_ = g.app.Command(cmd) // an error is in the status
	}
	g.app.Frame(time.Now())
	return nil
}

// Draw repaints the images that changed (the fields at their small size,
// the overlay only when the settings or the screen changed), and composes
// them on the screen: the fields scaled to their panels with linear
// filtering, the overlay over them.
func (g *game) Draw(screen *ebiten.Image) {
	b := screen.Bounds()
	w, h := b.Dx(), b.Dy()
	if w <= 0 || h <= 0 {
		return
	}
	g.mu.Lock()
	defer g.mu.Unlock()
	a := g.app
	fw, fh := a.FieldSize()
	if g.field[0] == nil || fw != g.fw || fh != g.fh {
		for k := range 2 {
			if g.field[k] != nil {
				g.field[k].Deallocate()
			}
			g.field[k] = ebiten.NewImage(fw, fh)
		}
		g.fieldPix = make([]byte, 4*fw*fh)
		g.fw, g.fh = fw, fh
		g.drawn = [4]int{-1, -1, -1, -1}
	}
	if g.overlay == nil || w != g.w || h != g.h {
		if g.overlay != nil {
			g.overlay.Deallocate()
		}
		g.overlay = ebiten.NewImage(w, h)
		g.ovPix = make([]byte, 4*w*h)
		g.w, g.h = w, h
		g.drawn = [4]int{-1, -1, -1, -1}
	}
	vers := [4]int{a.liveVer, a.meanVer, a.overlayVer, a.vecVer}
	if vers == g.drawn {
		return // the screen keeps the last picture
	}
	full := vers[2] != g.drawn[2]
	l := a.Layout(w, h)
	// the arrows over the running mean, repainted when they changed; a
	// change of them redraws the running mean's panel
	vw, vh := l.Panel[1].Dx(), l.Panel[1].Dy()
	arrows := a.set.Arrows == "evec" && vw > 0 && vh > 0
	if arrows && (g.vectors == nil || g.vectors.Bounds().Dx() != vw || g.vectors.Bounds().Dy() != vh) {
		if g.vectors != nil {
			g.vectors.Deallocate()
		}
		g.vectors = ebiten.NewImage(vw, vh)
		g.vecPix = make([]byte, 4*vw*vh)
		g.drawn[3] = -1
	}
	vecChanged := vers[3] != g.drawn[3]
	if vecChanged && arrows {
		a.PaintVectors(g.vecPix, vw, vh)
		g.vectors.WritePixels(g.vecPix)
	}
	for k := range 2 {
		if full || vers[k] != g.drawn[k] {
			a.PaintField(&g.pt, k, g.fieldPix)
			g.field[k].WritePixels(g.fieldPix)
		}
	}
	if full {
		a.PaintOverlay(g.ovPix, w, h)
		g.overlay.WritePixels(g.ovPix)
		for k := range 2 {
			g.ovPanel[k] = g.overlay.SubImage(l.Panel[k]).(*ebiten.Image)
		}
		screen.Fill(color.White)
	}
	if g.first == 0 {
		g.first = js.Global().Get("performance").Call("now").Float()
	}
	// the panels whose field changed, each with its part of the overlay;
	// the rest of the screen keeps what it has
	for k := range 2 {
		if !full && vers[k] == g.drawn[k] && !(k == 1 && vecChanged) {
			continue
		}
		r := l.Panel[k]
		g.op.Filter = ebiten.FilterLinear
		g.op.GeoM.Reset()
		g.op.GeoM.Scale(float64(r.Dx())/float64(fw), float64(r.Dy())/float64(fh))
		g.op.GeoM.Translate(float64(r.Min.X), float64(r.Min.Y))
		screen.DrawImage(g.field[k], &g.op)
		if !full {
			g.op.Filter = ebiten.FilterNearest
			g.op.GeoM.Reset()
			g.op.GeoM.Translate(float64(r.Min.X), float64(r.Min.Y))
			screen.DrawImage(g.ovPanel[k], &g.op)
		}
		if k == 1 && arrows {
			g.op.Filter = ebiten.FilterNearest
			g.op.GeoM.Reset()
			g.op.GeoM.Translate(float64(r.Min.X), float64(r.Min.Y))
			screen.DrawImage(g.vectors, &g.op)
		}
	}
	if full {
		screen.DrawImage(g.overlay, nil)
	}
	g.drawn = vers
}

// LayoutF draws in device pixels (sharp on high-density screens), at most
// maxPixels of them.
func (g *game) LayoutF(ow, oh float64) (float64, float64) {
	s := ebiten.Monitor().DeviceScaleFactor()
	w, h := ow*s, oh*s
	if w*h > maxPixels {
		f := math.Sqrt(maxPixels / (w * h))
		w, h = w*f, h*f
	}
	return math.Max(1, math.Floor(w)), math.Max(1, math.Floor(h))
}

func (g *game) Layout(ow, oh int) (int, int) { panic("LayoutF is used") }

// controlInfo is a control as the page's script sees it.
type controlInfo struct {
	Name    string   `json:"name"`
	Label   string   `json:"label"`
	Unit    string   `json:"unit"`
	Options []option `json:"options,omitempty"`
}

func main() {
	app, err := newApp(defaultScenario(), defaultGrid, time.Now())
	if err != nil {
		js.Global().Get("console").Call("error", "eddyblock: "+err.Error())
		return
	}
	g := &game{app: app}
	toJS := func(v any) any {
		b, err := json.Marshal(v)
		if err != nil {
			return js.Null()
		}
		return js.Global().Get("JSON").Call("parse", string(b))
	}
	api := js.Global().Get("Object").New()
	api.Set("set", js.FuncOf(func(this js.Value, args []js.Value) any {
		if len(args) != 2 {
			return "set(name, value) takes two arguments"
		}
		g.mu.Lock()
		defer g.mu.Unlock()
		if err := g.app.Set(args[0].String(), args[1].String()); err != nil {
			return err.Error()
		}
		return ""
	}))
	api.Set("command", js.FuncOf(func(this js.Value, args []js.Value) any {
		if len(args) != 1 {
			return "command(name) takes one argument"
		}
		g.mu.Lock()
		defer g.mu.Unlock()
		if err := g.app.Command(args[0].String()); err != nil {
			return err.Error()
		}
		return ""
	}))
	api.Set("status", js.FuncOf(func(this js.Value, args []js.Value) any {
		g.mu.Lock()
		st := g.app.Status()
		st.FirstFrameAt = g.first
		g.mu.Unlock()
		return toJS(st)
	}))
	api.Set("controls", js.FuncOf(func(this js.Value, args []js.Value) any {
		var cs []controlInfo
		for _, c := range controls() {
			cs = append(cs, controlInfo{c.Name, c.Label, c.Unit, c.Options})
		}
		return toJS(cs)
	}))
	js.Global().Set("eddyblock", api)
	if f := js.Global().Get("eddyblockReady"); f.Type() == js.TypeFunction {
		f.Invoke()
	}

	ebiten.SetTPS(ebiten.SyncWithFPS)
	ebiten.SetRunnableOnUnfocused(true)
	ebiten.SetScreenClearedEveryFrame(false)
	if err := ebiten.RunGameWithOptions(g, &ebiten.RunGameOptions{InitUnfocused: true}); err != nil {
		js.Global().Get("console").Call("error", fmt.Sprintf("eddyblock: %v", err))
	}
}

// defaultScenario is the scenario the page starts with: the one named in
// the page address (?scenario=name) if it is a built-in, else the default.
func defaultScenario() string {
	q := js.Global().Get("location").Get("search").String()
	p := js.Global().Get("URLSearchParams").New(q)
	if v := p.Call("get", "scenario"); v.Type() == js.TypeString {
		if _, err := newSettings(v.String(), defaultGrid); err == nil {
			return v.String()
		}
	}
	return "wave-train-strained-by-block"
}
