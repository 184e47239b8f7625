package fft

// The real-to-complex post-processing (see postT) fused with the last radix-4 stage of the forward
// zonal transforms, and the complex-to-real pre-processing (see preT) fused with the first radix-4
// stage of the inverse ones. This saves a pass over the chunk buffer. The pairs (t, h−t) that the
// processing couples come from the butterflies j and R−j of the last stage (p and m/4−p of the first).

// postPair returns X[t] = E + W^t·O and X[h−t] = conj(E − W^t·O) from zk = Z[t], zm = Z[h−t] and
// hw = W^t/2 (see postT).
func postPair(zk, zm, hw complex128) (complex128, complex128) {
	a, b := real(zk), imag(zk)
	c, d := real(zm), imag(zm)
	sr, sd := a+c, b-d
	dr, ds := a-c, b+d
	tr := real(hw)*ds + imag(hw)*dr
	ti := imag(hw)*ds - real(hw)*dr
	return complex(0.5*sr+tr, 0.5*sd+ti), complex(0.5*sr-tr, ti-0.5*sd)
}

// prePair returns Z[t] and Z[h−t] from xk = X[t], xm = X[h−t], hw = c·W^t/2 and half = c/2 (see preT).
func prePair(xk, xm, hw complex128, half float64) (complex128, complex128) {
	a, b := real(xk), imag(xk)
	c, d := real(xm), imag(xm)
	sr, sd := a+c, b-d
	dr, ds := a-c, b+d
	or := real(hw)*dr + imag(hw)*ds
	oi := real(hw)*ds - imag(hw)*dr
	return complex(half*sr-oi, half*sd+or), complex(half*sr+oi, or-half*sd)
}

// postLast4 runs the last forward stage (radix 4, sub-length 4, R = h/4) on the chunk buffer x (row
// stride bi) of l rows and writes the post-processed spectra of rows ya.. into dst (row stride w >= h),
// column 0 holding X[0] + i·X[h] as in postT. (postPair and last4 are written out by hand in the loop:
// the compiler does not inline them.)
func postLast4(dst, x []complex128, h, w, R, bi, l, ya int, hw []complex128) {
	hw = hw[:h/2+1]
	for q := 0; q < l; q++ {
		row := dst[(ya+q)*w : (ya+q)*w+w]
		xq := x[q:]
		z0, z1, z2, z3 := last4(xq, 0, R, bi)
		row[0] = complex(real(z0)+imag(z0), real(z0)-imag(z0))
		row[R], row[3*R] = postPair(z1, z3, hw[R])
		row[2*R], _ = postPair(z2, z2, hw[2*R])
		for j := 1; j <= R/2; j++ {
			jm := R - j
			// butterflies j and jm of the last stage
			a, b, c, d := xq[bi*j], xq[bi*(j+R)], xq[bi*(j+2*R)], xq[bi*(j+3*R)]
			apc, amc := a+c, a-c
			bpd, bmd := b+d, b-d
			jbmd := complex(-imag(bmd), real(bmd))
			a0, a1, a2, a3 := apc+bpd, amc-jbmd, apc-bpd, amc+jbmd
			a, b, c, d = xq[bi*jm], xq[bi*(jm+R)], xq[bi*(jm+2*R)], xq[bi*(jm+3*R)]
			apc, amc = a+c, a-c
			bpd, bmd = b+d, b-d
			jbmd = complex(-imag(bmd), real(bmd))
			b0, b1, b2, b3 := apc+bpd, amc-jbmd, apc-bpd, amc+jbmd
			{
				hwr, hwi := real(hw[j]), imag(hw[j])
				sr, sd := real(a0)+real(b3), imag(a0)-imag(b3)
				dr, ds := real(a0)-real(b3), imag(a0)+imag(b3)
				tr := hwr*ds + hwi*dr
				ti := hwi*ds - hwr*dr
				row[j] = complex(0.5*sr+tr, 0.5*sd+ti)
				row[h-(j)] = complex(0.5*sr-tr, ti-0.5*sd)
			}
			{
				hwr, hwi := real(hw[j+R]), imag(hw[j+R])
				sr, sd := real(a1)+real(b2), imag(a1)-imag(b2)
				dr, ds := real(a1)-real(b2), imag(a1)+imag(b2)
				tr := hwr*ds + hwi*dr
				ti := hwi*ds - hwr*dr
				row[j+R] = complex(0.5*sr+tr, 0.5*sd+ti)
				row[h-(j+R)] = complex(0.5*sr-tr, ti-0.5*sd)
			}
			if jm != j {
				{
					hwr, hwi := real(hw[jm]), imag(hw[jm])
					sr, sd := real(b0)+real(a3), imag(b0)-imag(a3)
					dr, ds := real(b0)-real(a3), imag(b0)+imag(a3)
					tr := hwr*ds + hwi*dr
					ti := hwi*ds - hwr*dr
					row[jm] = complex(0.5*sr+tr, 0.5*sd+ti)
					row[h-(jm)] = complex(0.5*sr-tr, ti-0.5*sd)
				}
				{
					hwr, hwi := real(hw[jm+R]), imag(hw[jm+R])
					sr, sd := real(b1)+real(a2), imag(b1)-imag(a2)
					dr, ds := real(b1)-real(a2), imag(b1)+imag(a2)
					tr := hwr*ds + hwi*dr
					ti := hwi*ds - hwr*dr
					row[jm+R] = complex(0.5*sr+tr, 0.5*sd+ti)
					row[h-(jm+R)] = complex(0.5*sr-tr, ti-0.5*sd)
				}
			}
		}
	}
}

// preFirst4 forms the pre-processed sequences Z of rows ya.. of src (row stride w > h−1, column 0 holding
// X[0] + i·X[h]) and runs the first inverse stage (radix 4, sub-length h, R = 1) on them, writing the
// chunk buffer y with row stride bo. tw are the stage's backward twiddles. (prePair and first4 are
// written out by hand in the loop: the compiler does not inline them.)
func preFirst4(y, src []complex128, h, w, bo, l, ya int, hw []complex128, half float64, tw []complex128) {
	m0 := h / 4
	hw = hw[:h/2+1]
	tw = tw[:3*m0]
	for q := 0; q < l; q++ {
		row := src[(ya+q)*w : (ya+q)*w+w]
		yq := y[q:]
		x0 := row[0]
		a, c := real(x0), imag(x0)
		z0 := complex(half*(a+c), half*(a-c))
		z1, z3 := prePair(row[m0], row[3*m0], hw[m0], half)
		z2, _ := prePair(row[2*m0], row[2*m0], hw[2*m0], half)
		first4(yq, 0, bo, z0, z1, z2, z3, 1, 1, 1)
		for p := 1; p <= m0/2; p++ {
			pm := m0 - p
			var a0, b3 complex128
			{
				xk, xm := row[p], row[h-p]
				hwr, hwi := real(hw[p]), imag(hw[p])
				sr, sd := real(xk)+real(xm), imag(xk)-imag(xm)
				dr, ds := real(xk)-real(xm), imag(xk)+imag(xm)
				or := hwr*dr + hwi*ds
				oi := hwr*ds - hwi*dr
				a0 = complex(half*sr-oi, half*sd+or)
				b3 = complex(half*sr+oi, or-half*sd)
			}
			var a1, b2 complex128
			{
				xk, xm := row[p+m0], row[h-p-m0]
				hwr, hwi := real(hw[p+m0]), imag(hw[p+m0])
				sr, sd := real(xk)+real(xm), imag(xk)-imag(xm)
				dr, ds := real(xk)-real(xm), imag(xk)+imag(xm)
				or := hwr*dr + hwi*ds
				oi := hwr*ds - hwi*dr
				a1 = complex(half*sr-oi, half*sd+or)
				b2 = complex(half*sr+oi, or-half*sd)
			}
			if pm == p {
				{
					w1, w2, w3 := tw[3*p], tw[3*p+1], tw[3*p+2]
					apc, amc := a0+b2, a0-b2
					bpd, bmd := a1+b3, a1-b3
					jbmd := complex(-imag(bmd), real(bmd))
					o := bo * 4 * p
					yq[o] = apc + bpd
					yq[o+bo] = w1 * (amc + jbmd)
					yq[o+2*bo] = w2 * (apc - bpd)
					yq[o+3*bo] = w3 * (amc - jbmd)
				}
				continue
			}
			var b0, a3 complex128
			{
				xk, xm := row[pm], row[h-pm]
				hwr, hwi := real(hw[pm]), imag(hw[pm])
				sr, sd := real(xk)+real(xm), imag(xk)-imag(xm)
				dr, ds := real(xk)-real(xm), imag(xk)+imag(xm)
				or := hwr*dr + hwi*ds
				oi := hwr*ds - hwi*dr
				b0 = complex(half*sr-oi, half*sd+or)
				a3 = complex(half*sr+oi, or-half*sd)
			}
			var b1, a2 complex128
			{
				xk, xm := row[pm+m0], row[h-pm-m0]
				hwr, hwi := real(hw[pm+m0]), imag(hw[pm+m0])
				sr, sd := real(xk)+real(xm), imag(xk)-imag(xm)
				dr, ds := real(xk)-real(xm), imag(xk)+imag(xm)
				or := hwr*dr + hwi*ds
				oi := hwr*ds - hwi*dr
				b1 = complex(half*sr-oi, half*sd+or)
				a2 = complex(half*sr+oi, or-half*sd)
			}
			{
				w1, w2, w3 := tw[3*p], tw[3*p+1], tw[3*p+2]
				apc, amc := a0+a2, a0-a2
				bpd, bmd := a1+a3, a1-a3
				jbmd := complex(-imag(bmd), real(bmd))
				o := bo * 4 * p
				yq[o] = apc + bpd
				yq[o+bo] = w1 * (amc + jbmd)
				yq[o+2*bo] = w2 * (apc - bpd)
				yq[o+3*bo] = w3 * (amc - jbmd)
			}
			{
				w1, w2, w3 := tw[3*pm], tw[3*pm+1], tw[3*pm+2]
				apc, amc := b0+b2, b0-b2
				bpd, bmd := b1+b3, b1-b3
				jbmd := complex(-imag(bmd), real(bmd))
				o := bo * 4 * pm
				yq[o] = apc + bpd
				yq[o+bo] = w1 * (amc + jbmd)
				yq[o+2*bo] = w2 * (apc - bpd)
				yq[o+3*bo] = w3 * (amc - jbmd)
			}
		}
	}
}

// first4 is the inverse four-point butterfly p of a first stage (R = 1): it writes y[bo·(4p+k)].
func first4(y []complex128, p, bo int, a, b, c, d, w1, w2, w3 complex128) {
	apc, amc := a+c, a-c
	bpd, bmd := b+d, b-d
	jbmd := complex(-imag(bmd), real(bmd))
	o := bo * 4 * p
	y[o] = apc + bpd
	y[o+bo] = w1 * (amc + jbmd)
	y[o+2*bo] = w2 * (apc - bpd)
	y[o+3*bo] = w3 * (amc - jbmd)
}

// last4 is the forward four-point butterfly j of a last stage: it returns Z[j+R·k], k = 0..3, from
// x[bi·(j+R·k)].
func last4(x []complex128, j, R, bi int) (complex128, complex128, complex128, complex128) {
	a, b, c, d := x[bi*j], x[bi*(j+R)], x[bi*(j+2*R)], x[bi*(j+3*R)]
	apc, amc := a+c, a-c
	bpd, bmd := b+d, b-d
	jbmd := complex(-imag(bmd), real(bmd))
	return apc + bpd, amc - jbmd, apc - bpd, amc + jbmd
}
