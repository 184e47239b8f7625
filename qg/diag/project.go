package diag

import (
	"math"

	"github.com/eddyblock/eddyblock/qg"
)

const day = 86400.0

// Projection describes a streamfunction tendency X against a pattern P.
type Projection struct {
	// Rate is r = ⟨X, P⟩/⟨P, P⟩ in day⁻¹; r > 0 reinforces the pattern.
	Rate float64 `json:"rate_per_day"`
	// Correlation is the pattern correlation ⟨X, P⟩/√(⟨X, X⟩⟨P, P⟩).
	Correlation float64 `json:"correlation"`
	// DriftEast and DriftNorth are the velocities (km day⁻¹) at which the
	// parts of X along −∂xP and −∂yP would move the pattern, from the
	// least-squares fit of X on P, ∂xP and ∂yP.
	DriftEast  float64 `json:"drift_east_km_per_day"`
	DriftNorth float64 `json:"drift_north_km_per_day"`
	// Unexplained is the fraction of ⟨X, X⟩ that the fit leaves.
	Unexplained float64 `json:"unexplained"`
	// Barotropic and Baroclinic are the rates (day⁻¹) on the pattern's
	// barotropic part P_bt = (W1P1 + W2P2)(1, 1) and on its baroclinic
	// (thermal) part P_bc = P − P_bt = (P1 − P2)(W2, −W1), two orthogonal
	// patterns in either inner product, so that
	// Rate = (Barotropic·⟨P_bt, P_bt⟩ + Baroclinic·⟨P_bc, P_bc⟩)/⟨P, P⟩.
	// Baroclinic is 0 for a barotropic pattern (and Barotropic for a purely
	// baroclinic one).
	Barotropic float64 `json:"barotropic_rate_per_day"`
	Baroclinic float64 `json:"baroclinic_rate_per_day"`
}

// Fit projects the spectral streamfunction tendency x (m² s⁻², both layers,
// in the layout of g) on the spectral pattern p (m² s⁻¹) in the inner
// product norm. Both must be truncated to the retained modes. A pattern
// that is zero gives the zero Projection.
func Fit(g *qg.Grid, ph qg.Physics, norm Norm, x, p [2][]complex128) Projection {
	ns := g.Len()
	nk := g.Nkx
	dx := [2][]complex128{make([]complex128, ns), make([]complex128, ns)}
	dy := [2][]complex128{make([]complex128, ns), make([]complex128, ns)}
	for n := range 2 {
		for q, z := range p[n] {
			dx[n][q] = mulI(g.K(q%nk), z)
			dy[n][q] = mulI(g.L(q/nk), z)
		}
	}
	pats := [3][2][]complex128{p, dx, dy}
	var gram [3][3]float64
	var rhs [3]float64
	for i := range 3 {
		for j := i; j < 3; j++ {
			gram[i][j] = innerProduct(g, ph, norm, pats[i], pats[j])
			gram[j][i] = gram[i][j]
		}
		rhs[i] = innerProduct(g, ph, norm, x, pats[i])
	}
	xx := innerProduct(g, ph, norm, x, x)
	var pr Projection
	if !(gram[0][0] > 0) {
		return pr
	}
	pr.Rate = rhs[0] / gram[0][0] * day
	if xx > 0 {
		pr.Correlation = rhs[0] / math.Sqrt(xx*gram[0][0])
	}
	bt := [2][]complex128{make([]complex128, ns), make([]complex128, ns)}
	bc := [2][]complex128{make([]complex128, ns), make([]complex128, ns)}
	for q := range p[0] {
		b := complex(ph.W1, 0)*p[0][q] + complex(ph.W2, 0)*p[1][q]
		tau := p[0][q] - p[1][q]
		bt[0][q], bt[1][q] = b, b
		bc[0][q], bc[1][q] = complex(ph.W2, 0)*tau, complex(-ph.W1, 0)*tau
	}
	if nb := innerProduct(g, ph, norm, bt, bt); nb > 1e-12*gram[0][0] {
		pr.Barotropic = innerProduct(g, ph, norm, x, bt) / nb * day
	}
	if nc := innerProduct(g, ph, norm, bc, bc); nc > 1e-12*gram[0][0] {
		pr.Baroclinic = innerProduct(g, ph, norm, x, bc) / nc * day
	}
	c := solveGram(gram, rhs)
	// a tendency −c_x ∂xP moves P east at c_x (m s⁻¹); 86.4 km day⁻¹ per m s⁻¹.
	pr.DriftEast = -c[1] * day / 1000
	pr.DriftNorth = -c[2] * day / 1000
	if xx > 0 {
		var expl float64
		for i := range 3 {
			expl += c[i] * rhs[i]
		}
		pr.Unexplained = math.Max(0, 1-expl/xx)
	}
	return pr
}

// solveGram solves the symmetric system G c = b by Gaussian elimination with
// partial pivoting, leaving out patterns whose norm is negligible (a pattern
// without x or y dependence has a zero derivative).
func solveGram(gm [3][3]float64, b [3]float64) [3]float64 {
	var use []int
	for i := range 3 {
		if gm[i][i] > 1e-14*gm[0][0]*scale2(i, gm) {
			use = append(use, i)
		}
	}
	n := len(use)
	a := make([][]float64, n)
	for r, i := range use {
		a[r] = make([]float64, n+1)
		for s, j := range use {
			a[r][s] = gm[i][j]
		}
		a[r][n] = b[i]
	}
	for col := range n {
		piv := col
		for r := col + 1; r < n; r++ {
			if math.Abs(a[r][col]) > math.Abs(a[piv][col]) {
				piv = r
			}
		}
		a[col], a[piv] = a[piv], a[col]
		for r := col + 1; r < n; r++ {
			f := a[r][col] / a[col][col]
			for s := col; s <= n; s++ {
				a[r][s] -= f * a[col][s]
			}
		}
	}
	x := make([]float64, n)
	for r := n - 1; r >= 0; r-- {
		s := a[r][n]
		for k := r + 1; k < n; k++ {
			s -= a[r][k] * x[k]
		}
		x[r] = s / a[r][r]
	}
	var c [3]float64
	for r, i := range use {
		c[i] = x[r]
	}
	return c
}

// scale2 returns the squared wavenumber scale that makes the derivative
// patterns' norms comparable with the pattern's: ⟨∂P, ∂P⟩/⟨P, P⟩ is of the
// order of the pattern's squared wavenumber, at least that of the largest
// diagonal entry relative to G00.
func scale2(i int, gm [3][3]float64) float64 {
	if i == 0 {
		return 1
	}
	return math.Max(gm[1][1], gm[2][2]) / gm[0][0]
}

// mulI returns i·k·z.
func mulI(k float64, z complex128) complex128 { return complex(-k*imag(z), k*real(z)) }
