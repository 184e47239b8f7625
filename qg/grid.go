package qg

import "math"

// Grid describes the doubly periodic domain and its spectral representation.
//
// Physical fields have Ny rows of Nx points (index y*Nx + x, x fastest).
// Spectral fields have Ny rows of Nkx = Nx/2+1 zonal wavenumbers (index
// j*Nkx + i); i is the zonal index (k = 2πi/Lx) and j the meridional one
// (l = 2πj/Ly for j ≤ Ny/2, 2π(j−Ny)/Ly above). Coefficients are the
// unnormalised sums of the forward transform, so a field's domain mean of a
// product is (1/M²)·Σ over the full spectrum with M = Nx·Ny (see Inner).
//
// The scalar fields are read-only: a Grid is shared by a model and
// everything built on it. The wavenumbers, the 2/3-rule mask and the
// quadrature weights are read through methods.
type Grid struct {
	Nx, Ny int
	Nkx    int     // Nx/2 + 1
	Lx, Ly float64 // domain size, m
	Dx, Dy float64 // grid spacing, m

	k  []float64 // zonal wavenumber per column i, rad m⁻¹
	l  []float64 // meridional wavenumber per row j, rad m⁻¹
	k2 []float64 // k² + l² per spectral point

	// keep is 1 on the modes retained by the 2/3 rule (|i| ≤ Nx/3 and
	// |j| ≤ Ny/3) and 0 elsewhere; the model's state lives on these modes.
	keep []float64
	// keptRows lists the rows j that hold retained modes, and keptCols is
	// the number of leading columns that do (i < keptCols): the loops over
	// the state visit only these, the other coefficients being zero.
	keptRows []int
	keptCols int
	// weight is the Hermitian multiplicity of each stored coefficient (1
	// for i = 0 and i = Nx/2, 2 otherwise) times keep, divided by M², so that
	// Σ weight·Re(a·conj(b)) is the domain mean of the product of two
	// truncated fields.
	weight []float64
}

// Len returns the number of spectral points, Ny·Nkx.
func (g *Grid) Len() int { return len(g.k2) }

// Points returns the number of grid points, Nx·Ny.
func (g *Grid) Points() int { return g.Nx * g.Ny }

// K returns the zonal wavenumber of column i, k = 2πi/Lx (rad m⁻¹).
func (g *Grid) K(i int) float64 { return g.k[i] }

// L returns the meridional wavenumber of row j, l = 2πj/Ly for j ≤ Ny/2
// and 2π(j − Ny)/Ly above (rad m⁻¹).
func (g *Grid) L(j int) float64 { return g.l[j] }

// K2 returns k² + l² at spectral point p = j·Nkx + i (rad² m⁻²).
func (g *Grid) K2(p int) float64 { return g.k2[p] }

// Keep returns 1 if spectral point p is retained by the 2/3 rule
// (|i| ≤ Nx/3 and |j| ≤ Ny/3, the modes the model's state lives on) and 0
// otherwise, so that it can multiply a coefficient.
func (g *Grid) Keep(p int) float64 { return g.keep[p] }

// Weight returns the quadrature weight of spectral point p: the Hermitian
// multiplicity of the stored coefficient (1 for i = 0 and i = Nx/2, 2
// otherwise) times Keep(p), divided by (Nx·Ny)², so that
// Σ_p Weight(p)·Re(a_p·conj(b_p)) is the domain mean of the product of two
// truncated fields.
func (g *Grid) Weight(p int) float64 { return g.weight[p] }

// KeptCols returns the number of leading columns i that hold retained
// modes.
func (g *Grid) KeptCols() int { return g.keptCols }

// KeptRows returns the rows j that hold retained modes (a new slice).
func (g *Grid) KeptRows() []int { return append([]int(nil), g.keptRows...) }

// NewGrid builds the grid of a validated configuration.
func NewGrid(nx, ny int, lx, ly float64) *Grid {
	nkx := nx/2 + 1
	g := &Grid{
		Nx: nx, Ny: ny, Nkx: nkx, Lx: lx, Ly: ly,
		Dx: lx / float64(nx), Dy: ly / float64(ny),
		k: make([]float64, nkx), l: make([]float64, ny),
		k2: make([]float64, ny*nkx), keep: make([]float64, ny*nkx), weight: make([]float64, ny*nkx),
	}
	for i := range nkx {
		g.k[i] = 2 * math.Pi * float64(i) / lx
	}
	for j := range ny {
		jj := j
		if j > ny/2 {
			jj = j - ny
		}
		g.l[j] = 2 * math.Pi * float64(jj) / ly
	}
	g.keptCols = maxKeptIndex(nx) + 1
	for j := range ny {
		if j <= maxKeptIndex(ny) || ny-j <= maxKeptIndex(ny) {
			g.keptRows = append(g.keptRows, j)
		}
	}
	m := float64(nx) * float64(ny)
	for j := range ny {
		jj := j
		if j > ny/2 {
			jj = ny - j
		}
		for i := range nkx {
			p := j*nkx + i
			g.k2[p] = g.k[i]*g.k[i] + g.l[j]*g.l[j]
			if i <= maxKeptIndex(nx) && jj <= maxKeptIndex(ny) {
				g.keep[p] = 1
			}
			w := 2.0
			if i == 0 || i == nx/2 {
				w = 1
			}
			g.weight[p] = w * g.keep[p] / (m * m)
		}
	}
	return g
}

// MaxKeptK returns the magnitude of the largest retained zonal and
// meridional wavenumbers, rad m⁻¹.
func (g *Grid) MaxKeptK() (kmax, lmax float64) {
	return 2 * math.Pi * float64(maxKeptIndex(g.Nx)) / g.Lx, 2 * math.Pi * float64(maxKeptIndex(g.Ny)) / g.Ly
}

// maxKeptIndex is the largest wavenumber index retained by the 2/3 rule.
func maxKeptIndex(n int) int {
	m := n / 3
	if 3*m == n {
		m--
	}
	return m
}

// Inner returns the domain mean of a·b for two truncated spectral fields.
func (g *Grid) Inner(a, b []complex128) float64 {
	var s float64
	w := g.weight[:len(a)]
	b = b[:len(a)]
	for p, av := range a {
		s += w[p] * (real(av)*real(b[p]) + imag(av)*imag(b[p]))
	}
	return s
}

// X returns the x coordinate (m) of column x; Y that of row y.
func (g *Grid) X(x int) float64 { return float64(x) * g.Dx }

// Y returns the y coordinate (m) of row y.
func (g *Grid) Y(y int) float64 { return float64(y) * g.Dy }

// PeriodicDistance returns the signed shortest distance from b to a on a
// circle of length period, in [−period/2, period/2).
func PeriodicDistance(a, b, period float64) float64 {
	d := math.Mod(a-b, period)
	if d < -period/2 {
		d += period
	} else if d >= period/2 {
		d -= period
	}
	return d
}
