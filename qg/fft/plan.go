//go:build !fftw || !cgo

package fft

import (
	"fmt"
	"math"
	"runtime"

	"github.com/eddyblock/eddyblock/internal/team"
)

// Chunk sizes of the cache-blocked passes: the zonal transforms are done cy rows at a time and the
// meridional ones ci columns at a time, in worker-private buffers that stay in the core's cache.
const (
	cy = 16
	ci = 16
	// Row strides of the chunk buffers: one cache line more than the chunk, so that the legs of a
	// butterfly, a power of two of rows apart, do not fall into the same cache set.
	ldy = cy + 4
	ldc = ci + 4
)

// Plan2D transforms an ny×nx real field stored row-major (x fastest, index y*nx+x) to and from
// ny×(nx/2+1) complex coefficients stored row-major (kx fastest, index j*(nx/2+1)+i), where
// i = 0..nx/2 is the zonal wavenumber index and j = 0..ny-1 the meridional one (j > ny/2 are negative).
//
// A Plan2D owns its scratch buffers and is not safe for concurrent use: give each goroutine its own plan.
// Forward and Inverse panic if a slice has the wrong length. A plan with workers > 1 keeps workers−1
// helper goroutines, which poll briefly after each transform and then sleep; Close stops them (a plan
// that becomes unreachable without Close stops them too, later).
type Plan2D struct {
	*core
	team *team.Team // nil for one worker
}

// core holds everything the workers use.
type core struct {
	nx, ny, workers int
	h, w            int // nx/2 and nx/2+1

	// Column pruning (SetColumns): the transforms cover the zonal indices i < nc; nm = min(nc, h) columns
	// of mid/tmp go through the meridional pass, column 0 carrying column h only when nc = w.
	nc, nm int

	xf batch // forward zonal transforms, length h, last stage radix 4 (fused with the post-processing)
	xi batch // inverse zonal transforms, length h, first stage radix 4 (fused with the pre-processing)
	yb batch // length ny along y, batch of ci columns (layout [j][column])

	fpost []complex128 // forward post-processing weights exp(−2πik/nx)/2, k = 0..h/2
	ipre  []complex128 // inverse pre-processing weights c·exp(−2πik/nx)/2, c = 1/(ny·h)
	ihalf float64      // c/2

	// mid and tmp (ny rows of stride ws) hold results for the columns 0..h−1: mid the forward's zonal
	// results, tmp its meridional partial results (before the last stage) and the inverse's meridional
	// results. ws is h rounded up to whole cache lines, so column ranges split at multiples of 4 share no
	// cache line between workers. With nc <= h, the columns nc..h−1 of tmp are zero (set by SetColumns;
	// both transforms then write only the columns < nc of tmp), which the inverse zonal pass reads.
	mid  []complex128
	tmp  []complex128
	ws   int
	bufs [][2][]complex128 // per-worker ping-pong buffers

	// per-call arguments for the worker goroutines
	phase int               // the phase being run
	runFn func(task, k int) // p.runTask, bound once (no allocation per phase)
	fsrc  []float64
	fdst  []complex128
	isrc  []complex128
	idst  []float64
}

// NewPlan2D makes a plan for nx, ny powers of two, each >= 4. workers >= 1 is the number of goroutines a
// transform may use; results are bit-identical for any number of workers.
func NewPlan2D(nx, ny, workers int) (*Plan2D, error) {
	if err := checkArgs(nx, ny, workers); err != nil {
		return nil, err
	}
	h := nx / 2
	w := h + 1
	p := &core{
		nx: nx, ny: ny, workers: workers, h: h, w: w, nc: w, nm: h,
		xf: newBatchRadices(h, radicesLast4(h)),
		xi: newBatchRadices(h, reversed(radicesLast4(h))),
		yb: newBatch(ny, false),
	}
	p.ws = (h+3)/4*4 + 4 // whole cache lines, and not a power of two (cache set conflicts)
	p.mid = make([]complex128, ny*p.ws)
	p.tmp = make([]complex128, ny*p.ws)
	size := max(h*ldy, ny*ldc)
	p.bufs = make([][2][]complex128, workers)
	for k := range p.bufs {
		p.bufs[k] = [2][]complex128{make([]complex128, size), make([]complex128, size)}
	}
	scale := 1 / float64(ny*h)
	p.ihalf = 0.5 * scale
	for k := 0; k <= h/2; k++ {
		sin, cos := math.Sincos(-2 * math.Pi * float64(k) / float64(nx))
		p.fpost = append(p.fpost, complex(0.5*cos, 0.5*sin))
		p.ipre = append(p.ipre, complex(0.5*scale*cos, 0.5*scale*sin))
	}
	p.runFn = p.runTask
	plan := &Plan2D{core: p}
	if workers > 1 {
		t, err := team.New(workers)
		if err != nil {
			return nil, err
		}
		plan.team = t
		runtime.AddCleanup(plan, func(t *team.Team) { t.Close() }, t)
	}
	return plan, nil
}

// Close stops the plan's helper goroutines and waits for them to return. The plan must not be used
// afterwards; calling Close again does nothing.
func (p *Plan2D) Close() {
	if p.team != nil {
		p.team.Close()
	}
}

// Phases of the transforms: each is a list of independent tasks, which any worker may take.
const (
	phFwdRows = iota // zonal transforms of a chunk of rows: field → mid
	phFwdCols        // meridional transforms but the last stage, of a chunk of columns: mid → tmp
	phFwdLast        // last meridional stage for a block of rows: tmp → dst
	phInvCols        // meridional inverse transforms of a chunk of columns: src → mid
	phInvRows        // zonal inverse transforms of a chunk of rows: mid → field
)

// runTask runs task c of the current phase as worker k.
func (p *core) runTask(c, k int) { p.task(p.phase, c, k) }

// task runs task c of phase ph as worker k.
func (p *core) task(ph, c, k int) {
	switch ph {
	case phFwdRows:
		p.forwardRows(c, k)
	case phFwdCols:
		p.forwardCols(c, k)
	case phFwdLast:
		p.forwardLast(c)
	case phInvCols:
		p.inverseCols(c, k)
	case phInvRows:
		p.inverseRows(c, k)
	}
}

// ntasks returns the number of tasks of phase ph. The chunks do not depend on the number of workers.
func (p *core) ntasks(ph int) int {
	switch ph {
	case phFwdRows, phInvRows:
		return (p.ny + cy - 1) / cy
	case phFwdCols, phInvCols:
		return (p.nm + ci - 1) / ci
	default:
		return min(p.yb.stages[len(p.yb.stages)-1].r, 8)
	}
}

// part returns chunk c of n items cut into nc near-equal chunks, with the cuts at multiples of unit.
func part(c, nc, n, unit int) (int, int) {
	lo, hi := c*n/nc/unit*unit, (c+1)*n/nc/unit*unit
	if c == nc-1 {
		hi = n
	}
	return lo, hi
}

func reversed(rs []int) []int {
	out := make([]int, len(rs))
	for i, r := range rs {
		out[len(rs)-1-i] = r
	}
	return out
}

// Nx returns the number of grid points along x.
func (p *Plan2D) Nx() int { return p.nx }

// Ny returns the number of grid points along y.
func (p *Plan2D) Ny() int { return p.ny }

// Workers returns the number of goroutines a transform may use.
func (p *Plan2D) Workers() int { return p.workers }

// SetColumns restricts the transforms to the zonal wavenumbers i < ncols (1 ≤ ncols ≤ nx/2+1; ncols =
// nx/2+1 restores the full transform): Inverse treats the coefficients of columns i ≥ ncols as zero (it
// does not read them), and Forward computes only the columns i < ncols and writes zeros in the others.
// The meridional pass then transforms only the first ncols columns, which saves about a sixth of the
// work when the spectrum is truncated by the 2/3 rule. Results are the same, value for value, as those
// of the full transform with the columns i ≥ ncols zeroed (Inverse: in its input; Forward: in its
// output). It returns an error, and leaves the plan unchanged, if ncols is out of range.
func (p *Plan2D) SetColumns(ncols int) error {
	if err := checkColumns(ncols, p.nx); err != nil {
		return err
	}
	p.nc, p.nm = ncols, min(ncols, p.h)
	if ncols <= p.h {
		for y := 0; y < p.ny; y++ {
			clear(p.tmp[y*p.ws+ncols : y*p.ws+p.h])
		}
	}
	return nil
}

// Columns returns the number of zonal wavenumbers the transforms cover (see SetColumns).
func (p *Plan2D) Columns() int { return p.nc }

// parallel runs the tasks of phase ph on all workers and waits for them.
func (p *Plan2D) parallel(ph int) {
	n := p.ntasks(ph)
	if p.team == nil {
		for c := 0; c < n; c++ {
			p.task(ph, c, 0)
		}
		return
	}
	p.phase = ph
	p.team.Tasks(n, p.runFn)
}

// Forward computes dst[j*(nx/2+1)+i] = Σ_y Σ_x src[y*nx+x]·exp(−2πi(i·x/nx + j·y/ny)) (unnormalised).
// src is not modified. It panics unless len(src) = nx·ny and len(dst) = ny·(nx/2+1).
func (p *Plan2D) Forward(dst []complex128, src []float64) {
	if len(src) != p.nx*p.ny {
		panic(fmt.Sprintf("fft: Forward: len(src) = %d, want nx·ny = %d", len(src), p.nx*p.ny))
	}
	if len(dst) != p.ny*p.w {
		panic(fmt.Sprintf("fft: Forward: len(dst) = %d, want ny·(nx/2+1) = %d", len(dst), p.ny*p.w))
	}
	p.fsrc, p.fdst = src, dst
	p.parallel(phFwdRows)
	p.parallel(phFwdCols)
	p.parallel(phFwdLast)
	splitCol(dst, p.ny, p.h, p.nc == p.w)
	p.fsrc, p.fdst = nil, nil
}

// forwardRows does the zonal real-to-complex transforms of row chunk c as worker k: half-length complex
// transforms of the rows read as complex pairs (the first stage reads the field directly), then the
// post-processing into mid (fused with the last stage).
func (p *core) forwardRows(c, k int) {
	ya, yb := part(c, p.ntasks(phFwdRows), p.ny, 1)
	l := yb - ya
	cur, nxt := p.bufs[k][0], p.bufs[k][1]
	xs := p.xf.stages
	last := len(xs) - 1
	fused := xs[last].radix == 4
	i := 0
	switch xs[0].radix {
	case 4:
		fwd4Real(cur, p.fsrc[ya*p.nx:yb*p.nx], p.nx, p.h, ldy, l, xs[0].fw)
		i = 1
	case 8:
		fwd8Real(cur, p.fsrc[ya*p.nx:yb*p.nx], p.nx, p.h, ldy, l, xs[0].fw)
		i = 1
	default:
		packT(cur, p.fsrc, p.nx, ldy, ya, yb)
	}
	end := len(xs)
	if fused {
		end = last
	}
	for ; i < end; i++ {
		p.xf.do(i, nxt, cur, ldy, ldy, l, false)
		cur, nxt = nxt, cur
	}
	if fused && i == last {
		postLast4(p.mid, cur, p.h, p.ws, xs[last].r, ldy, l, ya, p.fpost)
	} else {
		postT(p.mid, cur, p.fpost, p.h, p.ws, ldy, ya, yb)
	}
}

// forwardCols does the meridional transforms, but for their last stage, of column chunk c of mid as
// worker k, writing tmp. Column 0 holds X[y][0] + i·X[y][h] (both real, packed by the post-processing).
// Only the columns < nm are transformed.
func (p *core) forwardCols(c, k int) {
	ia, ib := part(c, p.ntasks(phFwdCols), p.nm, 4)
	p.yb.runN(len(p.yb.stages)-1, p.tmp[ia:], p.mid[ia:], p.bufs[k][0], p.bufs[k][1], p.ws, p.ws, ldc, ib-ia, false)
}

// forwardLast does block c of the last meridional stage, tmp → dst, split by rows so that no two tasks
// write the same cache line of dst (but at the ends of their row blocks). With pruning (nc <= h) it
// writes the columns < nc and zeroes the others in the same rows.
func (p *core) forwardLast(c int) {
	st := &p.yb.stages[len(p.yb.stages)-1]
	j0, j1 := part(c, p.ntasks(phFwdLast), st.r, 1)
	p.yb.doRange(len(p.yb.stages)-1, p.fdst, p.tmp, p.ws, p.w, p.nm, false, j0, j1)
	if p.nc == p.w {
		return
	}
	// the stage writes the rows j + R·t, j0 <= j < j1, t < ny/R (see stockham.go)
	for j := j0; j < j1; j++ {
		for y := j; y < p.ny; y += st.r {
			clear(p.fdst[y*p.w+p.nc : y*p.w+p.w])
		}
	}
}

// Inverse computes dst[y*nx+x] = (1/(nx·ny)) Σ_j Σ_i c[j][i]·exp(2πi(i·x/nx + j·y/ny)), the sum running
// over the full Hermitian spectrum (c[j][nx−i] = conj(c[(ny−j) mod ny][i]) for 0 < i < nx/2), so
// Inverse(Forward(f)) = f. src is not modified. The result is the real part of that sum: the imaginary
// parts that must vanish for a real field are dropped after the meridional transform of the i = 0 and
// i = nx/2 columns, which is the same as replacing those two columns by their Hermitian-symmetric parts
// (c[j][i] + conj(c[−j][i]))/2 (so the imaginary parts of the self-conjugate entries j = 0, ny/2 are
// ignored). It panics unless len(src) = ny·(nx/2+1) and len(dst) = nx·ny.
func (p *Plan2D) Inverse(dst []float64, src []complex128) {
	if len(src) != p.ny*p.w {
		panic(fmt.Sprintf("fft: Inverse: len(src) = %d, want ny·(nx/2+1) = %d", len(src), p.ny*p.w))
	}
	if len(dst) != p.nx*p.ny {
		panic(fmt.Sprintf("fft: Inverse: len(dst) = %d, want nx·ny = %d", len(dst), p.nx*p.ny))
	}
	p.isrc, p.idst = src, dst
	p.parallel(phInvCols)
	p.parallel(phInvRows)
	p.isrc, p.idst = nil, nil
}

// inverseCols does the meridional inverse transforms of column chunk c as worker k, src → tmp. The
// columns i = 0 and i = h are transformed together, as column 0 of tmp holding the Hermitian part of
// column 0 plus i times that of column h (packed by joinCol; column h is taken as zero when pruned).
// Only the columns < nm are transformed.
func (p *core) inverseCols(c, k int) {
	ia, ib := part(c, p.ntasks(phInvCols), p.nm, 4)
	b0, b1 := p.bufs[k][0], p.bufs[k][1]
	if ia == 0 {
		joinCol(p.tmp, p.isrc, p.ny, p.h, ib, p.ws, p.nc == p.w)
		p.yb.run(p.tmp, p.tmp, b0, b1, p.ws, p.ws, ldc, ib, true)
		return
	}
	p.yb.runN(len(p.yb.stages), p.tmp[ia:], p.isrc[ia:], b0, b1, p.w, p.ws, ldc, ib-ia, true)
}

// inverseRows does the zonal complex-to-real transforms of row chunk c as worker k, tmp → field:
// pre-processing (fused with the first stage), half-length inverse transforms, the last stage writing
// the field.
func (p *core) inverseRows(c, k int) {
	ya, yb := part(c, p.ntasks(phInvRows), p.ny, 1)
	l := yb - ya
	cur, nxt := p.bufs[k][0], p.bufs[k][1]
	xs := p.xi.stages
	last := len(xs) - 1
	i := 0
	if xs[0].radix == 4 && last > 0 {
		preFirst4(cur, p.tmp, p.h, p.ws, ldy, l, ya, p.ipre, p.ihalf, xs[0].bw)
		i = 1
	} else {
		preT(cur, p.tmp, p.ipre, p.ihalf, p.h, p.ws, ldy, ya, yb)
	}
	for ; i < last; i++ {
		p.xi.do(i, nxt, cur, ldy, ldy, l, true)
		cur, nxt = nxt, cur
	}
	if xs[last].radix == 8 {
		bwdLast8Real(p.idst[ya*p.nx:yb*p.nx], cur, p.nx, xs[last].r, ldy, l)
	} else {
		bwdLastReal(p.idst[ya*p.nx:yb*p.nx], cur, p.nx, xs[last].radix, xs[last].r, ldy, l)
	}
}
