package linear

import (
	"fmt"
	"math"
	"math/cmplx"

	"gonum.org/v1/gonum/floats"
	"gonum.org/v1/gonum/mat"
)

// Solve finds the steady response to the steady PV forcing f (s⁻²,
// spectral, both layers) by restarted GMRES (Saad & Schultz 1986) on the
// fixed point of one time step of the forced linear model: with Φ the step
// of the unforced model and b the step from rest with the forcing, the
// steady state solves (I − Φ) q = b. Each iteration costs one time step.
// It stops when the residual falls below Options.Tol of ‖b‖.
//
// The Ritz values of the first Krylov space approximate the eigenvalues μ
// of Φ; when one lies outside the unit circle the basic state is unstable
// and Solve stops there with an *UnstableError giving the growth rate
// ln|μ|/dt: no time integration would settle on a steady response.
func (l *Model) Solve(f [2][]complex128, o Options) (Response, error) {
	o.defaults()
	if err := l.setForcing(f); err != nil {
		return Response{}, err
	}
	s := newSpace(l, o.Span)
	b, err := s.step(make([]float64, s.n))
	if err != nil {
		return Response{}, err
	}
	ref := floats.Norm(b, 2)
	if ref == 0 {
		return Response{Q: s.unpack(make([]float64, s.n))}, nil
	}
	// A x = x − Φx with Φx = (step(σx) − b)/σ: the Krylov vectors have unit
	// norm, and σ = ‖b‖ scales them to the size of a response, far from
	// the CFL limit (Φ is linear, so σ cancels)
	sigma := ref
	xs := make([]float64, s.n)
	apply := func(dst, x []float64) error {
		floats.ScaleTo(xs, sigma, x)
		y, err := s.step(xs)
		if err != nil {
			return err
		}
		for i := range dst {
			dst[i] = x[i] - (y[i]-b[i])/sigma
		}
		return nil
	}
	// unknown x = q/σ: A x = b/σ, of unit norm
	bs := scaled(b, 1/sigma)
	x := make([]float64, s.n)
	r := append([]float64(nil), bs...)
	beta := 1.0
	m := o.Restart
	iters, stalled := 0, 0
	var ritz []complex128
	for iters < o.MaxIterations {
		V := make([][]float64, m+1)
		H := mat.NewDense(m+1, m, nil)
		V[0] = scaled(r, 1/beta)
		g := make([]float64, m+1)
		g[0] = beta
		cs, sn := make([]float64, m), make([]float64, m)
		R := make([][]float64, m) // the rotated Hessenberg columns
		k := 0
		for ; k < m && iters < o.MaxIterations; k++ {
			w := make([]float64, s.n)
			if err := apply(w, V[k]); err != nil {
				return Response{}, err
			}
			iters++
			col := make([]float64, k+2)
			for pass := 0; pass < 2; pass++ { // modified Gram–Schmidt, twice
				for i := 0; i <= k; i++ {
					h := floats.Dot(w, V[i])
					col[i] += h
					floats.AddScaled(w, -h, V[i])
				}
			}
			col[k+1] = floats.Norm(w, 2)
			for i, v := range col {
				H.Set(i, k, v)
			}
			happy := col[k+1] == 0 // the Krylov space is invariant: x is exact
			if !happy {
				V[k+1] = scaled(w, 1/col[k+1])
			}
			for i := 0; i < k; i++ { // earlier rotations
				col[i], col[i+1] = cs[i]*col[i]+sn[i]*col[i+1], -sn[i]*col[i]+cs[i]*col[i+1]
			}
			den := math.Hypot(col[k], col[k+1])
			cs[k], sn[k] = col[k]/den, col[k+1]/den
			col[k], col[k+1] = den, 0
			g[k], g[k+1] = cs[k]*g[k], -sn[k]*g[k]
			R[k] = col
			if math.Abs(g[k+1]) <= o.Tol || happy {
				k++
				break
			}
		}
		if ritz == nil {
			ritz = ritzValues(H, k)
			if g := growth(ritz, float64(s.span)*l.m.Config().Dt); g > 0 {
				return Response{Iterations: iters}, &UnstableError{GrowthRate: g, Route: "gmres"}
			}
		}
		// y from the triangular system, then x += V y
		y := make([]float64, k)
		for i := k - 1; i >= 0; i-- {
			v := g[i]
			for j := i + 1; j < k; j++ {
				v -= R[j][i] * y[j]
			}
			y[i] = v / R[i][i]
		}
		for i := range k {
			floats.AddScaled(x, y[i], V[i])
		}
		// the true residual
		ax := make([]float64, s.n)
		if err := apply(ax, x); err != nil {
			return Response{}, err
		}
		iters++
		for i := range r {
			r[i] = bs[i] - ax[i]
		}
		last := beta
		beta = floats.Norm(r, 2)
		if beta <= o.Tol {
			return Response{Q: s.unpack(scaled(x, sigma)), Iterations: iters, Change: beta}, nil
		}
		if beta > 0.9*last {
			stalled++
			if stalled >= 3 { // three restarts that gained nothing: the rounding floor
				return Response{}, fmt.Errorf("%w: GMRES stalled at relative residual %.3g after %d iterations (tolerance %.3g): the rounding of the time step limits it; ask for less", ErrNotSettled, beta, iters, o.Tol)
			}
		} else {
			stalled = 0
		}
	}
	return Response{}, fmt.Errorf("%w: GMRES reached %d iterations with relative residual %.3g (tolerance %.3g)", ErrNotSettled, iters, beta, o.Tol)
}

func scaled(x []float64, c float64) []float64 {
	y := make([]float64, len(x))
	floats.ScaleTo(y, c, x)
	return y
}

// ritzValues returns the eigenvalues of the leading k×k block of the
// Arnoldi Hessenberg matrix (the Ritz values of A = I − Φ).
func ritzValues(H *mat.Dense, k int) []complex128 {
	if k == 0 {
		return []complex128{}
	}
	sub := mat.DenseCopyOf(H.Slice(0, k, 0, k))
	var e mat.Eigen
	if !e.Factorize(sub, mat.EigenNone) {
		return []complex128{}
	}
	return e.Values(nil)
}

// growth returns the largest growth rate (day⁻¹) among the eigenvalues
// μ = 1 − θ of one step that the Ritz values θ of I − Φ give, or 0 when
// all lie within the unit circle (to 1e-9).
func growth(ritz []complex128, dt float64) float64 {
	g := 0.0
	for _, th := range ritz {
		if a := cmplx.Abs(1 - th); a > 1+1e-9 {
			g = math.Max(g, math.Log(a)/dt*86400)
		}
	}
	return g
}

// space maps the model's retained spectral modes to a real vector.
type space struct {
	l     *Model
	index []int // retained spectral points
	n     int   // 2 layers × 2 (real, imaginary) × len(index)
	span  int   // time steps per application of the map
}

func newSpace(l *Model, span int) *space {
	g := l.m.Grid()
	s := &space{l: l, span: max(1, span)}
	for p := range g.Len() {
		if g.Keep(p) == 1 {
			s.index = append(s.index, p)
		}
	}
	s.n = 4 * len(s.index)
	return s
}

func (s *space) unpack(x []float64) [2][]complex128 {
	g := s.l.m.Grid()
	q := [2][]complex128{make([]complex128, g.Len()), make([]complex128, g.Len())}
	k := 0
	for n := range 2 {
		for _, p := range s.index {
			q[n][p] = complex(x[k], x[k+1])
			k += 2
		}
	}
	return q
}

func (s *space) pack(q [2][]complex128) []float64 {
	x := make([]float64, 0, s.n)
	for n := range 2 {
		for _, p := range s.index {
			x = append(x, real(q[n][p]), imag(q[n][p]))
		}
	}
	return x
}

// step returns the state span forced time steps after state x.
func (s *space) step(x []float64) ([]float64, error) {
	m := s.l.m
	if err := m.SetSpectralPV(s.unpack(x)); err != nil {
		return nil, err
	}
	if err := m.Run(s.span); err != nil {
		return nil, err
	}
	return s.pack(m.SpectralPV()), nil
}
