package fft

// packT stores rows y0..y1-1 of the real ny×nx field src as complex pairs z[m] = src[2m] + i·src[2m+1],
// transposed: dst[m*ld+y].
func packT(dst []complex128, src []float64, nx, ld, y0, y1 int) {
	h := nx / 2
	for y := y0; y < y1; y++ {
		row := src[y*nx : y*nx+nx]
		for m := 0; m < h; m++ {
			dst[m*ld+y] = complex(row[2*m], row[2*m+1])
		}
	}
}

// unpackT is the inverse of packT.
func unpackT(dst []float64, src []complex128, nx, ld, y0, y1 int) {
	h := nx / 2
	for y := y0; y < y1; y++ {
		row := dst[y*nx : y*nx+nx]
		for m := 0; m < h; m++ {
			v := src[m*ld+y]
			row[2*m] = real(v)
			row[2*m+1] = imag(v)
		}
	}
}

// postT turns the half-length transforms Z[k][y] (layout src[k*ld+y], k < h) of the packed rows into the
// real-to-complex spectra X[y][k] (layout dst[y*(h+1)+k], k = 0..h):
// X[k] = E + W^k·O, X[h−k] = conj(E − W^k·O), E = (Z[k] + conj Z[h−k])/2, O = (Z[k] − conj Z[h−k])/(2i),
// with W = exp(−2πi/nx). hw[k] = W^k/2.
func postT(dst, src []complex128, hw []complex128, h, ld, y0, y1 int) {
	w := h + 1
	for k := 0; k <= h/2; k++ {
		km := (h - k) % h
		zk := src[k*ld : k*ld+ld]
		zm := src[km*ld : km*ld+ld]
		hwr, hwi := real(hw[k]), imag(hw[k])
		for y := y0; y < y1; y++ {
			a, b := real(zk[y]), imag(zk[y])
			c, d := real(zm[y]), imag(zm[y])
			sr, sd := a+c, b-d
			dr, ds := a-c, b+d
			tr := hwr*ds + hwi*dr
			ti := hwi*ds - hwr*dr
			dst[y*w+k] = complex(0.5*sr+tr, 0.5*sd+ti)
			dst[y*w+h-k] = complex(0.5*sr-tr, ti-0.5*sd)
		}
	}
}

// preT is the inverse of postT, scaled: from the spectra X[y][k] (layout src[y*(h+1)+k]) it forms
// Z[k] = c·(E + i·O), E = (X[k] + conj X[h−k])/2, O = W^−k·(X[k] − conj X[h−k])/2, stored transposed as
// dst[k*ld+y]. The imaginary parts of X[0] and X[h] are ignored. hw[k] = c·W^k/2 and half = c/2.
func preT(dst, src []complex128, hw []complex128, half float64, h, ld, y0, y1 int) {
	w := h + 1
	for y := y0; y < y1; y++ {
		a, c := real(src[y*w]), real(src[y*w+h])
		dst[y] = complex(half*(a+c), half*(a-c))
	}
	for k := 1; k <= h/2; k++ {
		hwr, hwi := real(hw[k]), imag(hw[k])
		zk := dst[k*ld : k*ld+ld]
		zm := dst[(h-k)*ld : (h-k)*ld+ld]
		for y := y0; y < y1; y++ {
			xk, xm := src[y*w+k], src[y*w+h-k]
			a, b := real(xk), imag(xk)
			c, d := real(xm), imag(xm)
			sr, sd := a+c, b-d
			dr, ds := a-c, b+d
			or := hwr*dr + hwi*ds
			oi := hwr*ds - hwi*dr
			zk[y] = complex(half*sr-oi, half*sd+or)
			zm[y] = complex(half*sr+oi, or-half*sd)
		}
	}
}
