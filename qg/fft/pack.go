package fft

// The functions here move data between the caller's row-major arrays and the worker-private chunk
// buffers, where a chunk of rows (or columns) forms the batch: element t of the chunk's sequence q is at
// buf[t*ld+q].

// packT stores rows ya..yb-1 of the real field src (row length nx) as complex pairs
// z[m] = src[2m] + i·src[2m+1], transposed: dst[m*ld+(y−ya)].
func packT(dst []complex128, src []float64, nx, ld, ya, yb int) {
	h := nx / 2
	for y := ya; y < yb; y++ {
		row := src[y*nx : y*nx+nx]
		q := y - ya
		for m := 0; m < h; m++ {
			dst[m*ld+q] = complex(row[2*m], row[2*m+1])
		}
	}
}

// postT turns the half-length transforms Z[k] (chunk layout src[k*ld+(y−ya)], k < h) of the packed rows
// ya..yb-1 into their real-to-complex spectra X[k], k = 0..h, stored in dst[y*w+k] (w >= h):
// X[k] = E + W^k·O, X[h−k] = conj(E − W^k·O), E = (Z[k] + conj Z[h−k])/2, O = (Z[k] − conj Z[h−k])/(2i),
// with W = exp(−2πi/nx) and Z[h] = Z[0] (standard real-FFT post-processing). hw[k] = W^k/2.
// X[0] and X[h] are real; they are stored packed as dst[y*w] = X[0] + i·X[h] (see splitCol).
func postT(dst, src []complex128, hw []complex128, h, w, ld, ya, yb int) {
	hw = hw[:h/2+1]
	for y := ya; y < yb; y++ {
		q := y - ya
		row := dst[y*w : y*w+w]
		z0 := src[q]
		row[0] = complex(real(z0)+imag(z0), real(z0)-imag(z0)) // X[0] + i·X[h], both real

		for k := 1; k < len(hw); k++ {
			hwr, hwi := real(hw[k]), imag(hw[k])
			zk, zm := src[k*ld+q], src[(h-k)*ld+q]
			a, b := real(zk), imag(zk)
			c, d := real(zm), imag(zm)
			sr, sd := a+c, b-d
			dr, ds := a-c, b+d
			tr := hwr*ds + hwi*dr
			ti := hwi*ds - hwr*dr
			row[k] = complex(0.5*sr+tr, 0.5*sd+ti)
			row[h-k] = complex(0.5*sr-tr, ti-0.5*sd)
		}
	}
}

// preT is the inverse of postT, scaled by c: from the spectra X[k] (src[y*w+k]) of rows ya..yb-1 it
// forms Z[k] = c·(E + i·O), E = (X[k] + conj X[h−k])/2, O = W^−k·(X[k] − conj X[h−k])/2, stored in
// dst[k*ld+(y−ya)]. X[0] and X[h] are read packed as src[y*w] = X[0] + i·X[h]. hw[k] = c·W^k/2 and half = c/2.
func preT(dst, src []complex128, hw []complex128, half float64, h, w, ld, ya, yb int) {
	n := yb - ya
	z0 := dst[:n]
	for q := range z0 {
		o := (ya + q) * w
		a, c := real(src[o]), imag(src[o]) // X[0] + i·X[h], packed by joinCol
		z0[q] = complex(half*(a+c), half*(a-c))
	}
	for k := 1; k <= h/2; k++ {
		hwr, hwi := real(hw[k]), imag(hw[k])
		zk := dst[k*ld : k*ld+n]
		zm := dst[(h-k)*ld : (h-k)*ld+n]
		zm = zm[:len(zk)]
		for q := range zk {
			o := (ya + q) * w
			xk, xm := src[o+k], src[o+h-k]
			a, b := real(xk), imag(xk)
			c, d := real(xm), imag(xm)
			sr, sd := a+c, b-d
			dr, ds := a-c, b+d
			or := hwr*dr + hwi*ds
			oi := hwr*ds - hwi*dr
			zk[q] = complex(half*sr-oi, half*sd+or)
			zm[q] = complex(half*sr+oi, or-half*sd)
		}
	}
}

// splitCol unpacks column 0 of the row-major ny×(h+1) array a, holding the transform Z of x0 + i·xh for
// two real sequences x0, xh, into the transforms of x0 (column 0) and xh (column h):
// F0[j] = (Z[j] + conj Z[−j])/2, Fh[j] = (Z[j] − conj Z[−j])/(2i) (two real FFTs for one, common practice).
// Without withH it writes column 0 only.
func splitCol(a []complex128, ny, h int, withH bool) {
	w := h + 1
	for j := 0; j <= ny/2; j++ {
		m := (ny - j) % ny
		zj, zm := a[j*w], a[m*w]
		sr, sd := 0.5*(real(zj)+real(zm)), 0.5*(imag(zj)-imag(zm))
		dr, ds := 0.5*(real(zj)-real(zm)), 0.5*(imag(zj)+imag(zm))
		if !withH {
			if m == j {
				a[j*w] = complex(sr, 0)
			} else {
				a[j*w], a[m*w] = complex(sr, sd), complex(sr, -sd)
			}
			continue
		}
		if m == j {
			a[j*w], a[j*w+h] = complex(sr, 0), complex(ds, 0)
			continue
		}
		a[j*w], a[j*w+h] = complex(sr, sd), complex(ds, -dr)
		a[m*w], a[m*w+h] = complex(sr, -sd), complex(ds, dr)
	}
}

// joinCol fills columns 0..ib−1 of dst (row stride wd) from src (ny×(h+1)): column 0 gets H0 + i·Hh, where
// H0[j] = (c[j][0] + conj c[−j][0])/2 and Hh likewise from column h are the Hermitian parts of the
// columns i = 0 and i = h of src, whose inverse transforms are the real sequences x0 and xh, so the
// inverse transform of column 0 is x0 + i·xh. Columns 1..ib−1 are copied. Without withH column h is
// taken as zero (not read).
func joinCol(dst, src []complex128, ny, h, ib, wd int, withH bool) {
	w := h + 1
	for j := 0; j < ny; j++ {
		m := (ny - j) % ny
		c0, c0m := src[j*w], src[m*w]
		var ch, chm complex128
		if withH {
			ch, chm = src[j*w+h], src[m*w+h]
		}
		h0r, h0i := 0.5*(real(c0)+real(c0m)), 0.5*(imag(c0)-imag(c0m))
		hhr, hhi := 0.5*(real(ch)+real(chm)), 0.5*(imag(ch)-imag(chm))
		dst[j*wd] = complex(h0r-hhi, h0i+hhr)
		copy(dst[j*wd+1:j*wd+ib], src[j*w+1:j*w+ib])
	}
}
