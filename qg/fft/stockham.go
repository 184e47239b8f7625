package fft

import "math"

// This file holds the Stockham kernels. They work on a batch of l complex sequences of length n stored
// with the batch index fastest: element t of sequence q is at x[q+bi*t], where the row stride bi >= l lets
// the batch be a block of columns of a larger row-major array. A stage of radix r and sub-length m,
// after earlier stages whose radices multiply to R (so m·R = n), reads
//
//	x[q + bi*(j + R*(p + k*m/r))]   and writes   y[q + bo*(j + R*(r*p + k))],
//
// for q < l, j < R, p < m/r, k < r. The twiddles depend on p only, so the innermost loop over q runs over
// contiguous memory with the twiddles held in registers (vectorising across the batch). Each stage is
// out of place; the result comes out in natural order (self-sorting), with no bit reversal.

// stage is one pass of a Stockham transform.
type stage struct {
	m, r, radix int          // sub-length, product of the earlier radices, radix (2, 4 or 8)
	fw          []complex128 // forward twiddles: fw[(radix−1)p+k−1] = exp(−2πi·k·p/m), k = 1..radix−1, p < m/radix
	bw          []complex128 // backward (conjugate) twiddles
}

// batch is a plan for transforms of length n.
type batch struct {
	n      int
	stages []stage
}

// radices returns the radices of the stages for a transform of length n = 2^k: radix 8 where it can,
// radix 4 at the ends (the first and last stages have real-data variants for both), one radix 2 for n = 2.
// With only4 it uses radix 4 (and one radix 2 for odd k) throughout.
func radices(n int, only4 bool) []int {
	k := 0
	for 1<<k < n {
		k++
	}
	var rs []int
	switch {
	case only4:
		for ; k >= 2; k -= 2 {
			rs = append(rs, 4)
		}
		if k == 1 {
			rs = append(rs, 2)
		}
	case k == 1:
		rs = []int{2}
	case k%3 == 0:
		for ; k > 0; k -= 3 {
			rs = append(rs, 8)
		}
	case k%3 == 1: // 4·8·…·8·4
		rs = append(rs, 4)
		for k -= 4; k > 0; k -= 3 {
			rs = append(rs, 8)
		}
		rs = append(rs, 4)
	default: // 4·8·…·8
		rs = append(rs, 4)
		for k -= 2; k > 0; k -= 3 {
			rs = append(rs, 8)
		}
	}
	return rs
}

// radicesLast4 returns radices ending in radix 4 (8·…·8·4·…·4, as few stages as possible), for the
// forward zonal transform whose last stage is fused with the post-processing; reversed, they start with
// radix 4 for the inverse one. n = 2 and n = 8 are done in one stage of radix 2 and 8.
func radicesLast4(n int) []int {
	k := 0
	for 1<<k < n {
		k++
	}
	if k == 1 {
		return []int{2}
	}
	a := (k - 2) / 3
	for a >= 0 && (k-3*a)%2 != 0 {
		a--
	}
	var rs []int
	if a < 0 { // k = 3
		return []int{8}
	}
	for i := 0; i < a; i++ {
		rs = append(rs, 8)
	}
	for i := 0; i < (k-3*a)/2; i++ {
		rs = append(rs, 4)
	}
	return rs
}

func newBatch(n int, only4 bool) batch {
	return newBatchRadices(n, radices(n, only4))
}

func newBatchRadices(n int, rs []int) batch {
	b := batch{n: n}
	r, m := 1, n
	for _, radix := range rs {
		st := stage{m: m, r: r, radix: radix}
		if radix > 2 {
			q := m / radix
			st.fw = make([]complex128, (radix-1)*q)
			st.bw = make([]complex128, (radix-1)*q)
			for p := 0; p < q; p++ {
				for k := 1; k < radix; k++ {
					sin, cos := math.Sincos(-2 * math.Pi * float64(k*p) / float64(m))
					st.fw[(radix-1)*p+k-1] = complex(cos, sin)
					st.bw[(radix-1)*p+k-1] = complex(cos, -sin)
				}
			}
		}
		b.stages = append(b.stages, st)
		m /= radix
		r *= radix
	}
	return b
}

// do runs stage i on l sequences, reading x with row stride bi and writing y with row stride bo.
func (b *batch) do(i int, y, x []complex128, bi, bo, l int, inverse bool) {
	b.doRange(i, y, x, bi, bo, l, inverse, 0, b.stages[i].r)
}

// doRange runs the part j0 <= j < j1 of stage i (see the index maps above); the parts with disjoint
// j-ranges read and write disjoint elements.
func (b *batch) doRange(i int, y, x []complex128, bi, bo, l int, inverse bool, j0, j1 int) {
	st := &b.stages[i]
	switch {
	case st.radix == 2:
		radix2(y, x, st.m, st.r, bi, bo, l, j0, j1)
	case st.radix == 8 && inverse:
		bwd8(y, x, st.m, st.r, bi, bo, l, j0, j1, st.bw)
	case st.radix == 8:
		fwd8(y, x, st.m, st.r, bi, bo, l, j0, j1, st.fw)
	case inverse:
		bwd4(y, x, st.m, st.r, bi, bo, l, j0, j1, st.bw)
	default:
		fwd4(y, x, st.m, st.r, bi, bo, l, j0, j1, st.fw)
	}
}

// run transforms l sequences: stage 0 reads in (stride bi), the last stage writes out (stride bo), and the
// stages in between ping-pong between the private buffers b0 and b1 (stride ld). in and out may be the
// same array (an in-place transform of a block of columns).
func (b *batch) run(out, in, b0, b1 []complex128, bi, bo, ld, l int, inverse bool) {
	ns := len(b.stages)
	if ns == 1 {
		gatherCols(b0, in, bi, ld, l, b.n)
		b.do(0, out, b0, ld, bo, l, inverse)
		return
	}
	b.do(0, b0, in, bi, ld, l, inverse)
	for i := 1; i < ns-1; i++ {
		b.do(i, b1, b0, ld, ld, l, inverse)
		b0, b1 = b1, b0
	}
	b.do(ns-1, out, b0, ld, bo, l, inverse)
}

// runN runs stages 0..n−1 on l sequences: the first reads in (stride bi), the last writes out (stride bo),
// the ones in between use the private buffers b0 and b1 (stride ld). out must not overlap in. With n = 0
// it copies in to out.
func (b *batch) runN(n int, out, in, b0, b1 []complex128, bi, bo, ld, l int, inverse bool) {
	switch n {
	case 0:
		for t := 0; t < b.n; t++ {
			copy(out[t*bo:t*bo+l], in[t*bi:t*bi+l])
		}
		return
	case 1:
		b.do(0, out, in, bi, bo, l, inverse)
		return
	}
	b.do(0, b0, in, bi, ld, l, inverse)
	for i := 1; i < n-1; i++ {
		b.do(i, b1, b0, ld, ld, l, inverse)
		b0, b1 = b1, b0
	}
	b.do(n-1, out, b0, ld, bo, l, inverse)
}

// gatherCols copies n rows of l columns from src (row stride si) to dst (row stride sd).
func gatherCols(dst, src []complex128, si, sd, l, n int) {
	for t := 0; t < n; t++ {
		copy(dst[t*sd:t*sd+l], src[t*si:t*si+l])
	}
}

// radix2 is a radix-2 stage without twiddles, valid only as a last stage (sub-length 2).
func radix2(y, x []complex128, m, R, bi, bo, l, j0, j1 int) {
	h := m / 2
	for p := 0; p < h; p++ {
		for j := j0; j < j1; j++ {
			i := bi * (j + R*p)
			o := bo * (j + R*2*p)
			a := x[i : i+l]
			b := x[i+bi*R*h : i+bi*R*h+l]
			ya := y[o : o+l]
			yb := y[o+bo*R : o+bo*R+l]
			b = b[:len(a)]
			ya = ya[:len(a)]
			yb = yb[:len(a)]
			for q, av := range a {
				bv := b[q]
				ya[q] = av + bv
				yb[q] = av - bv
			}
		}
	}
}

func fwd4(y, x []complex128, m, R, bi, bo, l, j0, j1 int, tw []complex128) {
	m0 := m / 4
	si, so := bi*R*m0, bo*R // input and output distance between the four legs
	for j := j0; j < j1; j++ {
		i, o := bi*j, bo*j
		a := x[i : i+l]
		b := x[i+si : i+si+l]
		c := x[i+2*si : i+2*si+l]
		d := x[i+3*si : i+3*si+l]
		ya := y[o : o+l]
		yb := y[o+so : o+so+l]
		yc := y[o+2*so : o+2*so+l]
		yd := y[o+3*so : o+3*so+l]
		b, c, d = b[:len(a)], c[:len(a)], d[:len(a)]
		ya, yb, yc, yd = ya[:len(a)], yb[:len(a)], yc[:len(a)], yd[:len(a)]
		for q, av := range a {
			bv, cv, dv := b[q], c[q], d[q]
			apc, amc := av+cv, av-cv
			bpd, bmd := bv+dv, bv-dv
			jbmd := complex(-imag(bmd), real(bmd))
			ya[q] = apc + bpd
			yc[q] = apc - bpd
			yb[q] = amc - jbmd
			yd[q] = amc + jbmd
		}
	}
	for p := 1; p < m0; p++ {
		w1, w2, w3 := tw[3*p], tw[3*p+1], tw[3*p+2]
		for j := j0; j < j1; j++ {
			i := bi * (j + R*p)
			o := bo * (j + R*4*p)
			a := x[i : i+l]
			b := x[i+si : i+si+l]
			c := x[i+2*si : i+2*si+l]
			d := x[i+3*si : i+3*si+l]
			ya := y[o : o+l]
			yb := y[o+so : o+so+l]
			yc := y[o+2*so : o+2*so+l]
			yd := y[o+3*so : o+3*so+l]
			b, c, d = b[:len(a)], c[:len(a)], d[:len(a)]
			ya, yb, yc, yd = ya[:len(a)], yb[:len(a)], yc[:len(a)], yd[:len(a)]
			for q, av := range a {
				bv, cv, dv := b[q], c[q], d[q]
				apc, amc := av+cv, av-cv
				bpd, bmd := bv+dv, bv-dv
				jbmd := complex(-imag(bmd), real(bmd))
				ya[q] = apc + bpd
				yc[q] = w2 * (apc - bpd)
				yb[q] = w1 * (amc - jbmd)
				yd[q] = w3 * (amc + jbmd)
			}
		}
	}
}

func bwd4(y, x []complex128, m, R, bi, bo, l, j0, j1 int, tw []complex128) {
	m0 := m / 4
	si, so := bi*R*m0, bo*R
	for j := j0; j < j1; j++ {
		i, o := bi*j, bo*j
		a := x[i : i+l]
		b := x[i+si : i+si+l]
		c := x[i+2*si : i+2*si+l]
		d := x[i+3*si : i+3*si+l]
		ya := y[o : o+l]
		yb := y[o+so : o+so+l]
		yc := y[o+2*so : o+2*so+l]
		yd := y[o+3*so : o+3*so+l]
		b, c, d = b[:len(a)], c[:len(a)], d[:len(a)]
		ya, yb, yc, yd = ya[:len(a)], yb[:len(a)], yc[:len(a)], yd[:len(a)]
		for q, av := range a {
			bv, cv, dv := b[q], c[q], d[q]
			apc, amc := av+cv, av-cv
			bpd, bmd := bv+dv, bv-dv
			jbmd := complex(-imag(bmd), real(bmd))
			ya[q] = apc + bpd
			yc[q] = apc - bpd
			yb[q] = amc + jbmd
			yd[q] = amc - jbmd
		}
	}
	for p := 1; p < m0; p++ {
		w1, w2, w3 := tw[3*p], tw[3*p+1], tw[3*p+2]
		for j := j0; j < j1; j++ {
			i := bi * (j + R*p)
			o := bo * (j + R*4*p)
			a := x[i : i+l]
			b := x[i+si : i+si+l]
			c := x[i+2*si : i+2*si+l]
			d := x[i+3*si : i+3*si+l]
			ya := y[o : o+l]
			yb := y[o+so : o+so+l]
			yc := y[o+2*so : o+2*so+l]
			yd := y[o+3*so : o+3*so+l]
			b, c, d = b[:len(a)], c[:len(a)], d[:len(a)]
			ya, yb, yc, yd = ya[:len(a)], yb[:len(a)], yc[:len(a)], yd[:len(a)]
			for q, av := range a {
				bv, cv, dv := b[q], c[q], d[q]
				apc, amc := av+cv, av-cv
				bpd, bmd := bv+dv, bv-dv
				jbmd := complex(-imag(bmd), real(bmd))
				ya[q] = apc + bpd
				yc[q] = w2 * (apc - bpd)
				yb[q] = w1 * (amc + jbmd)
				yd[q] = w3 * (amc - jbmd)
			}
		}
	}
}
