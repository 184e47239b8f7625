package fft

import "math"

// This file holds the batched Stockham kernels. A batch of complex sequences of length n is stored with
// the batch index fastest: element t of sequence q is at x[q+bs*t]. Each radix-4 stage of sub-length m
// and stride s (m*s = n*bs) reads x[q+s*(p+k*m/4)] and writes y[q+s*(4p+k)] for k = 0..3, p < m/4,
// q < s; the twiddle depends on p only, so the innermost loop runs over contiguous memory with the
// twiddles held in registers. A butterfly only mixes elements whose batch index q mod bs agrees, so a
// worker owning a range of batch indices can run every stage without synchronising with the others.

// stage is one pass of a batched Stockham transform.
type stage struct {
	m, s  int          // sub-length and stride
	radix int          // 4 or 2
	fw    []complex128 // forward twiddles: fw[3p+k-1] = exp(-2πi·k·p/m), k = 1..3, p < m/4
	bw    []complex128 // backward (conjugate) twiddles
}

// batch is a plan for transforms of length n over a batch of bs interleaved sequences.
type batch struct {
	n, bs  int
	stages []stage
}

func newBatch(n, bs int) batch {
	b := batch{n: n, bs: bs}
	s := bs
	for m := n; m > 1; {
		st := stage{m: m, s: s, radix: 4}
		if m == 2 {
			st.radix = 2
		} else {
			q := m / 4
			st.fw = make([]complex128, 3*q)
			st.bw = make([]complex128, 3*q)
			for p := 0; p < q; p++ {
				for k := 1; k <= 3; k++ {
					sin, cos := math.Sincos(-2 * math.Pi * float64(k*p) / float64(m))
					st.fw[3*p+k-1] = complex(cos, sin)
					st.bw[3*p+k-1] = complex(cos, -sin)
				}
			}
		}
		b.stages = append(b.stages, st)
		m /= st.radix
		s *= st.radix
	}
	return b
}

// run transforms the sequences with batch index in [b0, b1). Stage 0 reads in and writes x, stage 1 reads
// x and writes y, stage 2 reads y and writes x, and so on; run returns the buffer holding the result.
// in may equal y (never x). Only the entries of the owned batch indices are read or written.
func (b *batch) run(in, x, y []complex128, b0, b1 int, inverse bool) []complex128 {
	src, dst := in, x
	for i := range b.stages {
		st := &b.stages[i]
		switch {
		case st.radix == 2:
			radix2(dst, src, st.m, st.s, b.bs, b0, b1)
		case inverse:
			bwd4(dst, src, st.m, st.s, b.bs, b0, b1, st.bw)
		default:
			fwd4(dst, src, st.m, st.s, b.bs, b0, b1, st.fw)
		}
		if i == 0 {
			src, dst = x, y
		} else {
			src, dst = dst, src
		}
	}
	return src
}

func radix2(y, x []complex128, m, s, bs, b0, b1 int) {
	h := m / 2
	l := b1 - b0
	for p := 0; p < h; p++ {
		for r := 0; r < s; r += bs {
			i := r + b0 + s*p
			o := r + b0 + s*2*p
			a := x[i : i+l]
			b := x[i+s*h : i+s*h+l]
			ya := y[o : o+l]
			yb := y[o+s : o+s+l]
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

func fwd4(y, x []complex128, m, s, bs, b0, b1 int, tw []complex128) {
	m0 := m / 4
	l := b1 - b0
	for r := 0; r < s; r += bs {
		i := r + b0
		a := x[i : i+l]
		b := x[i+s*m0 : i+s*m0+l]
		c := x[i+2*s*m0 : i+2*s*m0+l]
		d := x[i+3*s*m0 : i+3*s*m0+l]
		ya := y[i : i+l]
		yb := y[i+s : i+s+l]
		yc := y[i+2*s : i+2*s+l]
		yd := y[i+3*s : i+3*s+l]
		b, c, d = b[:len(a)], c[:len(a)], d[:len(a)]
		ya, yb, yc, yd = ya[:len(a)], yb[:len(a)], yc[:len(a)], yd[:len(a)]
		for q, av := range a {
			bv, cv, dv := b[q], c[q], d[q]
			apc, amc := av+cv, av-cv
			bpd, bmd := bv+dv, bv-dv
			jbmd := complex(-imag(bmd), real(bmd))
			ya[q] = apc + bpd
			yb[q] = amc - jbmd
			yc[q] = apc - bpd
			yd[q] = amc + jbmd
		}
	}
	for p := 1; p < m0; p++ {
		w1, w2, w3 := tw[3*p], tw[3*p+1], tw[3*p+2]
		for r := 0; r < s; r += bs {
			i := r + b0 + s*p
			o := r + b0 + s*4*p
			a := x[i : i+l]
			b := x[i+s*m0 : i+s*m0+l]
			c := x[i+2*s*m0 : i+2*s*m0+l]
			d := x[i+3*s*m0 : i+3*s*m0+l]
			ya := y[o : o+l]
			yb := y[o+s : o+s+l]
			yc := y[o+2*s : o+2*s+l]
			yd := y[o+3*s : o+3*s+l]
			b, c, d = b[:len(a)], c[:len(a)], d[:len(a)]
			ya, yb, yc, yd = ya[:len(a)], yb[:len(a)], yc[:len(a)], yd[:len(a)]
			for q, av := range a {
				bv, cv, dv := b[q], c[q], d[q]
				apc, amc := av+cv, av-cv
				bpd, bmd := bv+dv, bv-dv
				jbmd := complex(-imag(bmd), real(bmd))
				ya[q] = apc + bpd
				yb[q] = w1 * (amc - jbmd)
				yc[q] = w2 * (apc - bpd)
				yd[q] = w3 * (amc + jbmd)
			}
		}
	}
}

func bwd4(y, x []complex128, m, s, bs, b0, b1 int, tw []complex128) {
	m0 := m / 4
	l := b1 - b0
	for r := 0; r < s; r += bs {
		i := r + b0
		a := x[i : i+l]
		b := x[i+s*m0 : i+s*m0+l]
		c := x[i+2*s*m0 : i+2*s*m0+l]
		d := x[i+3*s*m0 : i+3*s*m0+l]
		ya := y[i : i+l]
		yb := y[i+s : i+s+l]
		yc := y[i+2*s : i+2*s+l]
		yd := y[i+3*s : i+3*s+l]
		b, c, d = b[:len(a)], c[:len(a)], d[:len(a)]
		ya, yb, yc, yd = ya[:len(a)], yb[:len(a)], yc[:len(a)], yd[:len(a)]
		for q, av := range a {
			bv, cv, dv := b[q], c[q], d[q]
			apc, amc := av+cv, av-cv
			bpd, bmd := bv+dv, bv-dv
			jbmd := complex(-imag(bmd), real(bmd))
			ya[q] = apc + bpd
			yb[q] = amc + jbmd
			yc[q] = apc - bpd
			yd[q] = amc - jbmd
		}
	}
	for p := 1; p < m0; p++ {
		w1, w2, w3 := tw[3*p], tw[3*p+1], tw[3*p+2]
		for r := 0; r < s; r += bs {
			i := r + b0 + s*p
			o := r + b0 + s*4*p
			a := x[i : i+l]
			b := x[i+s*m0 : i+s*m0+l]
			c := x[i+2*s*m0 : i+2*s*m0+l]
			d := x[i+3*s*m0 : i+3*s*m0+l]
			ya := y[o : o+l]
			yb := y[o+s : o+s+l]
			yc := y[o+2*s : o+2*s+l]
			yd := y[o+3*s : o+3*s+l]
			b, c, d = b[:len(a)], c[:len(a)], d[:len(a)]
			ya, yb, yc, yd = ya[:len(a)], yb[:len(a)], yc[:len(a)], yd[:len(a)]
			for q, av := range a {
				bv, cv, dv := b[q], c[q], d[q]
				apc, amc := av+cv, av-cv
				bpd, bmd := bv+dv, bv-dv
				jbmd := complex(-imag(bmd), real(bmd))
				ya[q] = apc + bpd
				yb[q] = w1 * (amc + jbmd)
				yc[q] = w2 * (apc - bpd)
				yd[q] = w3 * (amc - jbmd)
			}
		}
	}
}
