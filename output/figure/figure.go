package figure

import (
	"bytes"
	"fmt"
	"image"
	"image/color"
	"image/png"
	"io"
	"math"
	"strconv"
	"strings"

	"gonum.org/v1/plot"
	"gonum.org/v1/plot/font"
	"gonum.org/v1/plot/text"
	"gonum.org/v1/plot/vg"
	"gonum.org/v1/plot/vg/draw"
	"gonum.org/v1/plot/vg/vgimg"

	"github.com/eddyblock/eddyblock/output/palette"
)

// Size is the size of a figure in pixels and the resolution its text and
// lines are drawn at (they are sized in points, 1/72 inch).
type Size struct {
	Width, Height int
	// DPI is pixels per inch; 0 means 96. Doubling both the pixel size and
	// the DPI gives the same figure at twice the resolution.
	DPI int
}

// Limits on figure sizes, in pixels.
const (
	MinWidth  = 160
	MinHeight = 120
	MaxSide   = 8192
)

func (s Size) dpi() int {
	if s.DPI == 0 {
		return 96
	}
	return s.DPI
}

func (s Size) check() error {
	if s.Width < MinWidth || s.Height < MinHeight || s.Width > MaxSide || s.Height > MaxSide {
		return fmt.Errorf("figure: size %d×%d pixels: width must be in [%d, %d] and height in [%d, %d]",
			s.Width, s.Height, MinWidth, MaxSide, MinHeight, MaxSide)
	}
	if s.DPI < 0 || s.DPI > 1200 {
		return fmt.Errorf("figure: DPI %d: must be in [1, 1200] (or 0 for 96)", s.DPI)
	}
	return nil
}

// Figure is anything this package can draw.
type Figure interface {
	// Draw checks the figure's inputs and renders it at size s.
	Draw(s Size) (*image.RGBA, error)
}

// WritePNG draws f at size s and writes it to w as PNG. Nothing is written
// if the inputs are bad.
func WritePNG(w io.Writer, f Figure, s Size) error {
	img, err := f.Draw(s)
	if err != nil {
		return err
	}
	return png.Encode(w, img)
}

// PNG draws f at size s and returns the PNG bytes.
func PNG(f Figure, s Size) ([]byte, error) {
	var b bytes.Buffer
	if err := WritePNG(&b, f, s); err != nil {
		return nil, err
	}
	return b.Bytes(), nil
}

// Field is a field on the doubly periodic (x, y) domain of the model:
// Values[j*Nx+i] is the value at x = i·Lx/Nx, y = j·Ly/Ny, with y increasing
// northward. If Bounded is set the grid does not wrap around and its points
// are the centres of cells instead: x = (i+½)·Lx/Nx, y = (j+½)·Ly/Ny.
type Field struct {
	Values  []float64
	Nx, Ny  int
	Lx, Ly  float64 // domain size (m)
	Bounded bool
}

// check reports a field that cannot be drawn, naming it.
func (f Field) check(name string) error {
	if f.Nx <= 0 || f.Ny <= 0 {
		return fmt.Errorf("figure: %s: grid size %d×%d: both must be positive", name, f.Nx, f.Ny)
	}
	if f.Nx < 2 || f.Ny < 2 {
		return fmt.Errorf("figure: %s: grid size %d×%d: need at least 2×2 points", name, f.Nx, f.Ny)
	}
	if len(f.Values) != f.Nx*f.Ny {
		return fmt.Errorf("figure: %s: %d values, want Nx×Ny = %d×%d = %d", name, len(f.Values), f.Nx, f.Ny, f.Nx*f.Ny)
	}
	if !(f.Lx > 0 && f.Ly > 0) || math.IsInf(f.Lx, 0) || math.IsInf(f.Ly, 0) {
		return fmt.Errorf("figure: %s: domain %g m × %g m: both sides must be positive and finite", name, f.Lx, f.Ly)
	}
	for k, v := range f.Values {
		if math.IsNaN(v) || math.IsInf(v, 0) {
			return fmt.Errorf("figure: %s: value %g at i = %d, j = %d (x = %.0f km, y = %.0f km)",
				name, v, k%f.Nx, k/f.Nx, f.kmX(float64(k%f.Nx)), f.kmY(float64(k/f.Nx)))
		}
	}
	return nil
}

func (f Field) grid() palette.Grid { return palette.Grid{Values: f.Values, Nx: f.Nx, Ny: f.Ny} }

// window returns the grid coordinates of the domain [0, Lx] × [0, Ly].
func (f Field) window() palette.Window {
	if f.Bounded {
		return palette.Window{X0: -0.5, Y0: -0.5, X1: float64(f.Nx) - 0.5, Y1: float64(f.Ny) - 0.5}
	}
	return palette.Window{X0: 0, Y0: 0, X1: float64(f.Nx), Y1: float64(f.Ny)}
}

// kmX and kmY convert grid coordinates to km.
func (f Field) kmX(gx float64) float64 {
	if f.Bounded {
		gx += 0.5
	}
	return gx * f.Lx / float64(f.Nx) / 1000
}

func (f Field) kmY(gy float64) float64 {
	if f.Bounded {
		gy += 0.5
	}
	return gy * f.Ly / float64(f.Ny) / 1000
}

func sameDomain(a, b Field) bool {
	return math.Abs(a.Lx-b.Lx) <= 1e-9*a.Lx && math.Abs(a.Ly-b.Ly) <= 1e-9*a.Ly
}

// canvas is one figure being drawn: the image, the gonum canvas over it and
// the text styles.
type canvas struct {
	img   *image.RGBA
	dc    draw.Canvas
	dpi   float64
	h     int
	text  richText
	title text.Style // 13 pt, centred
	label text.Style // 11 pt
	tick  text.Style // 9.5 pt
}

func newCanvas(s Size) *canvas {
	img := image.NewRGBA(image.Rect(0, 0, s.Width, s.Height))
	vc := vgimg.NewWith(vgimg.UseImage(img), vgimg.UseDPI(s.dpi()))
	c := &canvas{
		img: vc.Image().(*image.RGBA),
		dc:  draw.New(vc),
		dpi: float64(s.dpi()),
		h:   s.Height,
	}
	base := plot.New() // its styles carry gonum's defaults; nothing global is changed
	c.text = richText{fonts: base.TextHandler.Cache()}
	sans := font.Font{Typeface: "Liberation", Variant: "Sans"}
	st := base.Title.TextStyle
	st.Handler = c.text
	st.Font = font.From(sans, 13)
	c.title = st
	st.Font = font.From(sans, 11)
	st.XAlign, st.YAlign = draw.XLeft, draw.YCenter
	c.label = st
	st.Font = font.From(sans, 9.5)
	c.tick = st
	return c
}

// pixels returns the pixel rectangle of a rectangle of the canvas.
func (c *canvas) pixels(r vg.Rectangle) image.Rectangle {
	x0 := int(math.Round(r.Min.X.Dots(c.dpi)))
	x1 := int(math.Round(r.Max.X.Dots(c.dpi)))
	y0 := c.h - int(math.Round(r.Max.Y.Dots(c.dpi)))
	y1 := c.h - int(math.Round(r.Min.Y.Dots(c.dpi)))
	return image.Rect(x0, y0, x1, y1).Intersect(c.img.Bounds())
}

// newPlot returns a gonum plot styled for this package: sans-serif text, no
// background of its own (the canvas is white and rasters are painted into
// it before the plot is drawn).
func (c *canvas) newPlot(title, xlabel, ylabel string) *plot.Plot {
	p := plot.New()
	p.BackgroundColor = nil
	p.TextHandler = c.text
	p.Title.Text = title
	p.Title.TextStyle.Font = c.label.Font
	p.Title.TextStyle.Handler = c.text
	p.Title.Padding = vg.Points(4)
	p.Legend.TextStyle.Handler = c.text
	p.Legend.TextStyle.Font = c.tick.Font
	for _, ax := range []*plot.Axis{&p.X, &p.Y} {
		ax.Label.TextStyle.Font = c.label.Font
		ax.Label.TextStyle.Handler = c.text
		ax.Tick.Label.Font = c.tick.Font
		ax.Tick.Label.Handler = c.text
		ax.Tick.Length = vg.Points(4)
		ax.Padding = 0
		ax.LineStyle.Width = 0 // the plots draw a frame round their data area instead
		ax.Tick.Marker = niceTicks{}
	}
	p.X.Label.Text = xlabel
	p.Y.Label.Text = ylabel
	return p
}

// titleSpace returns the height a title takes at the top of a figure.
func (c *canvas) titleSpace(title string) vg.Length {
	if title == "" {
		return vg.Points(4)
	}
	return c.title.Height(title) + vg.Points(12)
}

// drawTitle writes a title across the top of area and returns what is left.
func (c *canvas) drawTitle(area draw.Canvas, title string) draw.Canvas {
	if title != "" {
		st := c.title
		st.XAlign, st.YAlign = draw.XCenter, draw.YTop
		area.FillText(st, vg.Point{X: (area.Min.X + area.Max.X) / 2, Y: area.Max.Y - vg.Points(4)}, title)
	}
	area.Max.Y -= c.titleSpace(title)
	return area
}

// tenTo returns "10ⁿ" with n in superscript digits.
func tenTo(n int) string {
	var b strings.Builder
	b.WriteString("10")
	for _, r := range strconv.Itoa(n) {
		if r == '-' {
			b.WriteRune('⁻')
		} else {
			b.WriteRune([]rune("⁰¹²³⁴⁵⁶⁷⁸⁹")[r-'0'])
		}
	}
	return b.String()
}

// decade returns the power of ten to factor out of values of magnitude m
// for readable tick labels: 0 for 10⁻² ≤ m < 10⁴.
func decade(m float64) int {
	if m == 0 || (m >= 1e-2 && m < 1e4) {
		return 0
	}
	return int(math.Floor(math.Log10(m)))
}

// formatNum writes v with three significant digits, as a×10ⁿ when it is
// very small or very large, with a true minus sign.
func formatNum(v float64) string { return formatSig(v, 3) }

// formatSig writes v with sig significant digits (see formatNum).
func formatSig(v float64, sig int) string {
	var s string
	if e := decade(math.Abs(v)); e != 0 {
		s = strconv.FormatFloat(v/math.Pow(10, float64(e)), 'g', sig, 64) + "×" + tenTo(e)
	} else {
		s = strconv.FormatFloat(v, 'g', sig, 64)
	}
	return strings.Replace(s, "-", "−", 1)
}

// frameStyle is the style of the frame around a map and of tick marks.
func frameStyle() draw.LineStyle { return draw.LineStyle{Color: color.Black, Width: vg.Points(0.6)} }

// niceTicks places about n (0: five) labelled ticks at multiples of 1, 2 or
// 5 times a power of ten, with unlabelled minor ticks between them.
type niceTicks struct{ n int }

func (t niceTicks) Ticks(lo, hi float64) []plot.Tick {
	if !(hi > lo) {
		return nil
	}
	n := t.n
	if n == 0 {
		n = 5
	}
	step := palette.NiceStep(hi-lo, n)
	minor := step / 5
	if m := step / math.Pow(10, math.Floor(math.Log10(step))); m == 2 {
		minor = step / 4
	}
	dec := max(0, -int(math.Floor(math.Log10(step)+1e-9)))
	var ticks []plot.Tick
	eps := 1e-9 * (hi - lo)
	for k := math.Ceil((lo - eps) / minor); k*minor <= hi+eps; k++ {
		v := k * minor
		if r := math.Round(v / step); math.Abs(v-r*step) < eps {
			v = r * step
			ticks = append(ticks, plot.Tick{Value: v, Label: tickLabel(v, dec)})
		} else {
			ticks = append(ticks, plot.Tick{Value: v})
		}
	}
	return ticks
}

// tickLabel formats v with dec decimals and a true minus sign.
func tickLabel(v float64, dec int) string {
	s := strconv.FormatFloat(v, 'f', dec, 64)
	if s == "-0" || strings.HasPrefix(s, "-0.") && strings.Trim(s, "-0.") == "" {
		s = s[1:]
	}
	return strings.Replace(s, "-", "−", 1)
}
