package fft

// fwd4Real is the first forward radix-4 stage (sub-length m = nx/2) of the half-length transforms of l
// real rows of length nx, read directly from the field as complex pairs z[t] = row[2t] + i·row[2t+1];
// the output goes to y with row stride bo, as for fwd4.
func fwd4Real(y []complex128, src []float64, nx, m, bo, l int, tw []complex128) {
	m0 := m / 4
	tw = tw[:3*m0]
	for q := 0; q < l; q++ {
		row := src[q*nx : q*nx+nx]
		ra := row[0 : 2*m0]
		rb := row[2*m0 : 4*m0]
		rc := row[4*m0 : 6*m0]
		rd := row[6*m0 : 8*m0]
		rb, rc, rd = rb[:len(ra)], rc[:len(ra)], rd[:len(ra)]
		yq := y[q:]
		for p := 0; p < m0; p++ {
			av := complex(ra[2*p], ra[2*p+1])
			bv := complex(rb[2*p], rb[2*p+1])
			cv := complex(rc[2*p], rc[2*p+1])
			dv := complex(rd[2*p], rd[2*p+1])
			apc, amc := av+cv, av-cv
			bpd, bmd := bv+dv, bv-dv
			jbmd := complex(-imag(bmd), real(bmd))
			o := bo * 4 * p
			yq[o] = apc + bpd
			yq[o+2*bo] = tw[3*p+1] * (apc - bpd)
			yq[o+bo] = tw[3*p] * (amc - jbmd)
			yq[o+3*bo] = tw[3*p+2] * (amc + jbmd)
		}
	}
}

// bwdLastReal is the last backward stage (radix 2 or 4, sub-length = radix, no twiddles) of the
// half-length inverse transforms of l rows, writing the complex result z[t] as the real pairs
// row[2t] = Re z[t], row[2t+1] = Im z[t] of rows of length nx in dst. x has row stride bi and R is the
// product of the earlier radices.
func bwdLastReal(dst []float64, x []complex128, nx, radix, R, bi, l int) {
	for q := 0; q < l; q++ {
		row := dst[q*nx : q*nx+nx]
		xq := x[q:]
		if radix == 2 {
			ra := row[0 : 2*R]
			rb := row[2*R : 4*R]
			rb = rb[:len(ra)]
			for j := 0; j < R; j++ {
				a, b := xq[bi*j], xq[bi*(j+R)]
				ra[2*j], ra[2*j+1] = real(a)+real(b), imag(a)+imag(b)
				rb[2*j], rb[2*j+1] = real(a)-real(b), imag(a)-imag(b)
			}
			continue
		}
		ra := row[0 : 2*R]
		rb := row[2*R : 4*R]
		rc := row[4*R : 6*R]
		rd := row[6*R : 8*R]
		rb, rc, rd = rb[:len(ra)], rc[:len(ra)], rd[:len(ra)]
		for j := 0; j < R; j++ {
			av, bv, cv, dv := xq[bi*j], xq[bi*(j+R)], xq[bi*(j+2*R)], xq[bi*(j+3*R)]
			apc, amc := av+cv, av-cv
			bpd, bmd := bv+dv, bv-dv
			jbmd := complex(-imag(bmd), real(bmd))
			s0 := apc + bpd
			s1 := amc + jbmd
			s2 := apc - bpd
			s3 := amc - jbmd
			ra[2*j], ra[2*j+1] = real(s0), imag(s0)
			rb[2*j], rb[2*j+1] = real(s1), imag(s1)
			rc[2*j], rc[2*j+1] = real(s2), imag(s2)
			rd[2*j], rd[2*j+1] = real(s3), imag(s3)
		}
	}
}
