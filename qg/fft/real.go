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

// fwd8Real is the first forward radix-8 stage (sub-length m = nx/2) of the half-length transforms of l
// real rows of length nx read as complex pairs (as fwd4Real).
func fwd8Real(y []complex128, src []float64, nx, m, bo, l int, tw []complex128) {
	m0 := m / 8
	tw = tw[:7*m0]
	for q := 0; q < l; q++ {
		row := src[q*nx : q*nx+nx]
		f0 := row[0 : 2*m0]
		f1 := row[2*m0 : 4*m0][:len(f0)]
		f2 := row[4*m0 : 6*m0][:len(f0)]
		f3 := row[6*m0 : 8*m0][:len(f0)]
		f4 := row[8*m0 : 10*m0][:len(f0)]
		f5 := row[10*m0 : 12*m0][:len(f0)]
		f6 := row[12*m0 : 14*m0][:len(f0)]
		f7 := row[14*m0 : 16*m0][:len(f0)]
		yq := y[q:]
		for p := 0; p < m0; p++ {
			v0 := complex(f0[2*p], f0[2*p+1])
			v1 := complex(f1[2*p], f1[2*p+1])
			v2 := complex(f2[2*p], f2[2*p+1])
			v3 := complex(f3[2*p], f3[2*p+1])
			v4 := complex(f4[2*p], f4[2*p+1])
			v5 := complex(f5[2*p], f5[2*p+1])
			v6 := complex(f6[2*p], f6[2*p+1])
			v7 := complex(f7[2*p], f7[2*p+1])
			o := bo * 8 * p
			a0, b0 := v0+v4, v0-v4
			a1, b1 := v1+v5, v1-v5
			a2, b2 := v2+v6, v2-v6
			a3, b3 := v3+v7, v3-v7
			t0, t1 := a0+a2, a0-a2
			t2, t3 := a1+a3, a1-a3
			jt3 := complex(imag(t3), -real(t3))
			c1 := complex(r2*(real(b1)+imag(b1)), r2*(imag(b1)-real(b1)))
			c3 := complex(r2*(imag(b3)-real(b3)), -r2*(real(b3)+imag(b3)))
			c2 := complex(imag(b2), -real(b2))
			u0, u1 := b0+c2, b0-c2
			u2, u3 := c1+c3, c1-c3
			ju3 := complex(imag(u3), -real(u3))
			yq[o+0*bo] = t0 + t2
			yq[o+4*bo] = tw[7*p+3] * (t0 - t2)
			yq[o+2*bo] = tw[7*p+1] * (t1 + jt3)
			yq[o+6*bo] = tw[7*p+5] * (t1 - jt3)
			yq[o+1*bo] = tw[7*p+0] * (u0 + u2)
			yq[o+5*bo] = tw[7*p+4] * (u0 - u2)
			yq[o+3*bo] = tw[7*p+2] * (u1 + ju3)
			yq[o+7*bo] = tw[7*p+6] * (u1 - ju3)
		}
	}
}

// bwdLast8Real is the last backward radix-8 stage (sub-length 8, no twiddles), writing real pairs into
// rows of length nx (as bwdLastReal).
func bwdLast8Real(dst []float64, x []complex128, nx, R, bi, l int) {
	for q := 0; q < l; q++ {
		row := dst[q*nx : q*nx+nx]
		f0 := row[0 : 2*R]
		f1 := row[2*R : 4*R][:len(f0)]
		f2 := row[4*R : 6*R][:len(f0)]
		f3 := row[6*R : 8*R][:len(f0)]
		f4 := row[8*R : 10*R][:len(f0)]
		f5 := row[10*R : 12*R][:len(f0)]
		f6 := row[12*R : 14*R][:len(f0)]
		f7 := row[14*R : 16*R][:len(f0)]
		xq := x[q:]
		for j := 0; j < R; j++ {
			v0 := xq[bi*(j+0*R)]
			v1 := xq[bi*(j+1*R)]
			v2 := xq[bi*(j+2*R)]
			v3 := xq[bi*(j+3*R)]
			v4 := xq[bi*(j+4*R)]
			v5 := xq[bi*(j+5*R)]
			v6 := xq[bi*(j+6*R)]
			v7 := xq[bi*(j+7*R)]
			a0, b0 := v0+v4, v0-v4
			a1, b1 := v1+v5, v1-v5
			a2, b2 := v2+v6, v2-v6
			a3, b3 := v3+v7, v3-v7
			t0, t1 := a0+a2, a0-a2
			t2, t3 := a1+a3, a1-a3
			jt3 := complex(-imag(t3), real(t3))
			c1 := complex(r2*(real(b1)-imag(b1)), r2*(imag(b1)+real(b1)))
			c3 := complex(-r2*(real(b3)+imag(b3)), r2*(real(b3)-imag(b3)))
			c2 := complex(-imag(b2), real(b2))
			u0, u1 := b0+c2, b0-c2
			u2, u3 := c1+c3, c1-c3
			ju3 := complex(-imag(u3), real(u3))
			s0 := t0 + t2
			f0[2*j], f0[2*j+1] = real(s0), imag(s0)
			s4 := t0 - t2
			f4[2*j], f4[2*j+1] = real(s4), imag(s4)
			s2 := t1 + jt3
			f2[2*j], f2[2*j+1] = real(s2), imag(s2)
			s6 := t1 - jt3
			f6[2*j], f6[2*j+1] = real(s6), imag(s6)
			s1 := u0 + u2
			f1[2*j], f1[2*j+1] = real(s1), imag(s1)
			s5 := u0 - u2
			f5[2*j], f5[2*j+1] = real(s5), imag(s5)
			s3 := u1 + ju3
			f3[2*j], f3[2*j+1] = real(s3), imag(s3)
			s7 := u1 - ju3
			f7[2*j], f7[2*j+1] = real(s7), imag(s7)
		}
	}
}
