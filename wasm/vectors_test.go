package main

import (
	"math"
	"strings"
	"testing"
	"time"
)

// TestVectors checks the arrows over the running mean: with them on, the
// App holds the diagnostics' E-vectors and mean streamfunction of the shown
// layer (diag's own fields, compared bit for bit with Fields' to rounding),
// refreshes them at most every vectorsEvery, and paints arrows and
// contours; off, it paints nothing.
func TestVectors(t *testing.T) {
	a, c := newTestApp(t, "wave-train-strained-by-block", 64)
	runDays(t, a, c, 8)
	const w, h = 600, 300
	pix := make([]byte, 4*w*h)
	a.PaintVectors(pix, w, h)
	if n := opaque(pix); n != 0 {
		t.Errorf("arrows off: %d painted pixels", n)
	}
	if got := a.Status().Text["arrows"]; got != "" {
		t.Errorf("arrows off: legend %q", got)
	}
	if err := a.Set("arrows", "evec"); err != nil {
		t.Fatal(err)
	}
	if err := a.Set("layer", "2"); err != nil {
		t.Fatal(err)
	}
	ver := a.vecVer
	a.Frame(c.next())
	if a.vecVer != ver+1 {
		t.Fatalf("the arrows were not computed at once after the change (version %d → %d)", ver, a.vecVer)
	}
	f := a.exp.Diag.Fields()
	for _, x := range []struct {
		name string
		got  []float64
	}{{"ex2", a.ex}, {"ey2", a.ey}, {"psi_mean2", a.psiMean}} {
		want, ok := f.Get(x.name)
		if !ok {
			t.Fatalf("no %s in Fields", x.name)
		}
		sc := maxAbs(want.Data)
		for i := range want.Data {
			if math.Abs(x.got[i]-want.Data[i]) > 1e-12*sc {
				t.Fatalf("%s at %d: %g, Fields' %g", x.name, i, x.got[i], want.Data[i])
			}
		}
	}
	// a frame soon after does not recompute them; one after vectorsEvery does
	ver = a.vecVer
	a.Frame(c.next())
	if a.vecVer != ver {
		t.Errorf("the arrows were recomputed %v after the last time", time.Second/60)
	}
	c.t = c.t.Add(vectorsEvery)
	runDays(t, a, c, 0.5)
	if a.vecVer == ver {
		t.Errorf("the arrows were not recomputed after %v and new samples", vectorsEvery)
	}
	a.PaintVectors(pix, w, h)
	if n := opaque(pix); n < 500 {
		t.Errorf("arrows on: only %d painted pixels", n)
	}
	if !strings.Contains(a.Status().Text["arrows"], "m² s⁻²") {
		t.Errorf("legend %q gives no arrow scale", a.Status().Text["arrows"])
	}
}

// TestArrowGeometry paints a uniform E-vector field pointing east, then
// north-west, and checks where the ink falls (common practice for vector
// plots: an arrow is centred on its grid point, its head at the end it
// points to, north up on the screen): the head's end of each arrow carries
// more ink than its tail's, along the vector's direction.
func TestArrowGeometry(t *testing.T) {
	a, _ := newTestApp(t, "wave-train-strained-by-block", 64)
	a.set.Arrows, a.vecSamples = "evec", 1
	clear(a.psiMean)
	a.contours = a.contours[:0]
	const w, h = 640, 320
	pix := make([]byte, 4*w*h)
	for _, dir := range []struct {
		name   string
		ex, ey float64
	}{{"east", 1, 0}, {"north-west", -1, 1}, {"south", 0, -1}} {
		for i := range a.ex {
			a.ex[i], a.ey[i] = dir.ex, dir.ey
		}
		a.vecMax = math.Hypot(dir.ex, dir.ey)
		a.PaintVectors(pix, w, h)
		every := a.arrowStride(w)
		spacing := float64(every) * w / 64
		// screen direction of the vector: y runs south
		ux, uy := dir.ex/a.vecMax, -dir.ey/a.vecMax
		var ahead, behind, arrows int
		for j := every / 2; j < 32; j += every {
			for i := every / 2; i < 64; i += every {
				arrows++
				cx := (float64(i) + 0.5) * w / 64
				cy := (32 - float64(j) - 0.5) * h / 32
				for py := int(cy - spacing); py <= int(cy+spacing); py++ {
					for px := int(cx - spacing); px <= int(cx+spacing); px++ {
						if px < 0 || py < 0 || px >= w || py >= h || pix[4*(py*w+px)+3] == 0 {
							continue
						}
						dx, dy := float64(px)+0.5-cx, float64(py)+0.5-cy
						along := dx*ux + dy*uy
						across := -dx*uy + dy*ux
						if math.Abs(across) > 0.25*spacing || math.Abs(along) > 0.5*spacing {
							continue // another arrow's ink
						}
						if along > 0 {
							ahead++
						} else {
							behind++
						}
					}
				}
			}
		}
		if arrows < 20 || 2*ahead < 3*behind || behind == 0 {
			t.Errorf("%s: %d arrows, %d inked pixels ahead of their centres, %d behind; want the head's side to carry clearly more", dir.name, arrows, ahead, behind)
		}
		if n := opaque(pix); n == 0 {
			t.Errorf("%s: nothing painted", dir.name)
		}
	}
}

// opaque counts the pixels of an RGBA image with any coverage.
func opaque(pix []byte) int {
	n := 0
	for i := 3; i < len(pix); i += 4 {
		if pix[i] != 0 {
			n++
		}
	}
	return n
}

// BenchmarkPaintVectors paints the arrows and contours over a running-mean
// panel of 800×400 pixels (done at most every vectorsEvery of wall time).
func BenchmarkPaintVectors(b *testing.B) {
	c := &clock{t: time.Date(2030, 1, 1, 0, 0, 0, 0, time.UTC)}
	a, err := newApp("wave-train-strained-by-block", 128, c.t)
	if err != nil {
		b.Fatal(err)
	}
	defer a.Close()
	if err := a.Set("arrows", "evec"); err != nil {
		b.Fatal(err)
	}
	for a.exp.Model.Time() < 8*86400 {
		a.Frame(c.next())
	}
	a.Frame(c.t.Add(time.Second))
	const w, h = 800, 400
	pix := make([]byte, 4*w*h)
	for b.Loop() {
		a.PaintVectors(pix, w, h)
	}
}
