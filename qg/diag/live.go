package diag

import (
	"fmt"
	"strings"

	"github.com/eddyblock/eddyblock/qg"
)

// liveBuf holds the work buffers of EddyField, allocated at its first call.
type liveBuf struct {
	fx, fy []float64
	fxh    []complex128
	c, ps  [2][]complex128
}

// EddyField sets dst (Ny rows of Nx points) to one eddy-forcing field of
// the window so far, named as in Fields: conv1, conv2, conv_vort1,
// conv_vort2, conv_interface1, conv_interface2 (s⁻²) or zt1, zt2, zt_vort1,
// zt_vort2, zt_interface1, zt_interface2 (m day⁻¹). It computes that field
// alone, in work buffers allocated at the first call and kept by the
// Accumulator, so a live display can refresh it often without allocating:
// a convergence costs two forward transforms and one inverse, a height
// tendency twice the forward transforms and the inversion.
//
// It also gives, for drawing the eddies over the mean flow, the E-vector
// components ex1, ey1, ex2, ey2 (m² s⁻², from the co-moments kept per grid
// point, no transform) and the time-mean streamfunction psi_mean1,
// psi_mean2 (m² s⁻¹, the prescribed block's included in the fixed mode, one
// inverse transform there), each equal to the field of that name in Fields.
//
// Without samples dst is set to zero. An unknown name or a dst of the wrong
// size is an error.
func (a *Accumulator) EddyField(name string, dst []float64) error {
	np := len(a.tau)
	if len(dst) != np {
		return fmt.Errorf("diag: EddyField: dst has %d points, the grid needs %d×%d", len(dst), a.g.Ny, a.g.Nx)
	}
	part, layer, height, ok := parseEddyField(name)
	kind, mlayer, mok := parseMeanFlowField(name)
	if !ok && !mok {
		return fmt.Errorf("diag: EddyField: no field %q (conv, conv_vort, conv_interface, zt, zt_vort, zt_interface, ex, ey or psi_mean with layer 1 or 2)", name)
	}
	if a.n == 0 {
		clear(dst)
		return nil
	}
	if mok {
		a.meanFlowField(kind, mlayer, dst)
		return nil
	}
	b := a.liveBuffers()
	layers := []int{layer}
	if height {
		layers = []int{0, 1} // ψ_t of one layer needs both layers' PV tendency
	}
	for _, n := range layers {
		a.liveConvergence(b, part, n)
	}
	if !height {
		a.plan.Inverse(dst, b.c[layer])
		return nil
	}
	a.m.Inverter().InvertLayer(layer, b.ps[layer], b.c)
	a.plan.Inverse(dst, b.ps[layer])
	zc := a.cfg.F0 / qg.Gravity * day
	for i := range dst {
		dst[i] *= zc
	}
	return nil
}

// parseEddyField splits a field name of EddyField into its part (0 the
// whole flux, 1 the vorticity part, 2 the interface part), its layer index
// and whether it is a height tendency, without allocating.
func parseEddyField(name string) (part, layer int, height, ok bool) {
	if len(name) < 2 {
		return 0, 0, false, false
	}
	switch name[len(name)-1] {
	case '1':
		layer = 0
	case '2':
		layer = 1
	default:
		return 0, 0, false, false
	}
	name = name[:len(name)-1]
	switch {
	case strings.HasPrefix(name, "conv"):
		name = name[len("conv"):]
	case strings.HasPrefix(name, "zt"):
		name, height = name[len("zt"):], true
	default:
		return 0, 0, false, false
	}
	switch name {
	case "":
		part = 0
	case "_vort":
		part = 1
	case "_interface":
		part = 2
	default:
		return 0, 0, false, false
	}
	return part, layer, height, true
}

// parseMeanFlowField splits a name of EddyField's E-vector and mean-flow
// fields into its kind ('x' for ex, 'y' for ey, 'p' for psi_mean) and its
// layer index.
func parseMeanFlowField(name string) (kind byte, layer int, ok bool) {
	n := len(name)
	if n < 2 || (name[n-1] != '1' && name[n-1] != '2') {
		return 0, 0, false
	}
	layer = int(name[n-1] - '1')
	switch name[:n-1] {
	case "ex":
		return 'x', layer, true
	case "ey":
		return 'y', layer, true
	case "psi_mean":
		return 'p', layer, true
	}
	return 0, 0, false
}

// meanFlowField sets dst to an E-vector component or the time-mean
// streamfunction of layer n, as Fields computes them.
func (a *Accumulator) meanFlowField(kind byte, n int, dst []float64) {
	if kind == 'p' {
		if a.mode == qg.Fixed {
			a.plan.Inverse(dst, a.blkPsi[n])
		} else {
			clear(dst)
		}
		for i, v := range a.mPsi[n][:len(dst)] {
			dst[i] += v
		}
		return
	}
	w := 1 / float64(a.n)
	for i := range dst {
		c := &a.cells[n][i]
		uu, vv, uv := c.uu*w, c.vv*w, c.uv*w
		if a.raw {
			uu += c.mu * c.mu
			vv += c.mv * c.mv
			uv += c.mu * c.mv
		}
		if kind == 'x' {
			dst[i] = vv - uu
		} else {
			dst[i] = -uv
		}
	}
}

// liveBuffers returns EddyField's work buffers, making them the first time.
func (a *Accumulator) liveBuffers() *liveBuf {
	if a.live == nil {
		np, ns := len(a.tau), a.g.Len()
		b := &liveBuf{fx: make([]float64, np), fy: make([]float64, np), fxh: make([]complex128, ns)}
		for n := range 2 {
			b.c[n] = make([]complex128, ns)
			b.ps[n] = make([]complex128, ns)
		}
		a.live = b
	}
	return a.live
}

// liveConvergence sets b.c[n] to the spectral convergence of one part of
// the eddy PV flux of layer n (0 the whole flux, 1 the relative-vorticity
// part, 2 the interface part), as analyse does for Fields.
func (a *Accumulator) liveConvergence(b *liveBuf, part, n int) {
	w := 1 / float64(a.n)
	mp1, mp2 := a.mPsi[0], a.mPsi[1]
	for i := range b.fx {
		c := &a.cells[n][i]
		var x, y, mean float64
		switch part {
		case 0:
			x, y, mean = c.uq, c.vq, c.mq
		case 1:
			x, y, mean = c.uz, c.vz, c.mz
		default:
			x, y, mean = c.ut, c.vt, mp1[i]-mp2[i]
		}
		x, y = x*w, y*w
		if a.raw {
			x += c.mu * mean
			y += c.mv * mean
		}
		b.fx[i], b.fy[i] = x, y
	}
	dst := b.c[n]
	a.plan.Forward(b.fxh, b.fx)
	a.plan.Forward(dst, b.fy)
	a.g.Convergence(dst, b.fxh, dst)
	if part == 2 {
		f := complex([2]float64{-a.ph.F1, a.ph.F2}[n], 0) // F_n (ψ_m − ψ_n) = ∓F_n (ψ1 − ψ2)
		for p := range dst {
			dst[p] *= f
		}
	}
}
