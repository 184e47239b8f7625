package diag

import (
	"fmt"

	"github.com/eddyblock/eddyblock/qg"
)

// Field is a named gridded field: Ny rows of Nx points, x fastest.
type Field struct {
	Name  string    `json:"name"`
	Long  string    `json:"long_name"`
	Units string    `json:"units"`
	Data  []float64 `json:"data"`
}

// Fields are the gridded diagnostics of the averaging window.
type Fields struct {
	Nx   int     `json:"nx"`
	Ny   int     `json:"ny"`
	Lx   float64 `json:"lx"` // m
	Ly   float64 `json:"ly"` // m
	List []Field `json:"fields"`
}

// Get returns the field of the given name.
func (f Fields) Get(name string) (Field, bool) {
	for _, x := range f.List {
		if x.Name == name {
			return x, true
		}
	}
	return Field{}, false
}

// Names returns the names of the fields, in order.
func (f Fields) Names() []string {
	n := make([]string, len(f.List))
	for i, x := range f.List {
		n[i] = x.Name
	}
	return n
}

// Fields returns the gridded diagnostics of the averaging window. Per layer
// n = 1, 2 (suffix n):
//
//	psi_mean n, q_mean n, u_mean n, v_mean n  time means of the full flow (the
//	                         block included in the fixed mode; u includes U_n;
//	                         q without its domain mean)
//	psi_ref n                the reference state ψ̄ (see the package doc)
//	uq n, vq n               eddy PV flux, m s⁻²
//	uv n, eke n              eddy momentum flux u′v′ and kinetic energy, m² s⁻²
//	ex n, ey n               E-vector (v′² − u′², −u′v′), m² s⁻²
//	conv n, conv_vort n, conv_interface n      eddy PV flux convergence and
//	                         its two parts, s⁻²
//	psit n, psit_vort n, psit_interface n      streamfunction tendencies, m² s⁻²
//	zt n, zt_vort n, zt_interface n            height tendencies f0 ψ_t/g, m day⁻¹
//	pattern n                the projection pattern, m² s⁻¹ (with a pattern)
//
// and for the column heat_flux v′(ψ1 − ψ2)′ (m³ s⁻²) and heat_flux_k (K m s⁻¹).
// Without samples it returns no fields.
func (a *Accumulator) Fields() Fields {
	g := a.g
	f := Fields{Nx: g.Nx, Ny: g.Ny, Lx: g.Lx, Ly: g.Ly}
	if a.n == 0 {
		return f
	}
	an := a.analyse()
	np := len(a.tau)
	grid := func(s []complex128) []float64 {
		x := make([]float64, np)
		a.plan.Inverse(x, s)
		return x
	}
	scaled := func(x []float64, c float64) []float64 {
		y := make([]float64, np)
		for i, v := range x {
			y[i] = c * v
		}
		return y
	}
	add := func(name, long, units string, data []float64) {
		f.List = append(f.List, Field{name, long, units, data})
	}
	zc := a.cfg.F0 / qg.Gravity * day
	us := [2]float64{a.ph.U1, a.ph.U2}
	for n := range 2 {
		L := n + 1
		psi, q, u := make([]float64, np), make([]float64, np), make([]float64, np)
		copy(psi, a.mPsi[n])
		copy(q, a.field(n, func(c *cell) float64 { return c.mq }))
		copy(u, a.field(n, func(c *cell) float64 { return c.mu }))
		v := a.field(n, func(c *cell) float64 { return c.mv })
		if a.mode == qg.Fixed {
			bp, bq := grid(a.blkPsi[n]), grid(a.blkQ[n])
			su, sv := make([]complex128, g.Len()), make([]complex128, g.Len())
			g.Velocity(su, sv, a.blkPsi[n])
			bu, bv := grid(su), grid(sv)
			for i := range psi {
				psi[i] += bp[i]
				q[i] += bq[i]
				u[i] += bu[i]
				v[i] += bv[i]
			}
		}
		for i := range u {
			u[i] += us[n]
		}
		mo := an.mom[n]
		ex, ey, eke := make([]float64, np), make([]float64, np), make([]float64, np)
		for i := range ex {
			ex[i] = mo.vv[i] - mo.uu[i]
			ey[i] = -mo.uv[i]
			eke[i] = 0.5 * (mo.uu[i] + mo.vv[i])
		}
		add(fmt.Sprintf("psi_mean%d", L), fmt.Sprintf("time-mean streamfunction, layer %d", L), "m2 s-1", psi)
		add(fmt.Sprintf("q_mean%d", L), fmt.Sprintf("time-mean PV anomaly, layer %d", L), "s-1", q)
		add(fmt.Sprintf("u_mean%d", L), fmt.Sprintf("time-mean zonal wind (imposed flow included), layer %d", L), "m s-1", u)
		add(fmt.Sprintf("v_mean%d", L), fmt.Sprintf("time-mean meridional wind, layer %d", L), "m s-1", v)
		add(fmt.Sprintf("psi_ref%d", L), fmt.Sprintf("reference state streamfunction, layer %d", L), "m2 s-1", grid(an.refPsi[n]))
		add(fmt.Sprintf("uq%d", L), fmt.Sprintf("eddy zonal PV flux u'q', layer %d", L), "m s-2", mo.uq)
		add(fmt.Sprintf("vq%d", L), fmt.Sprintf("eddy meridional PV flux v'q', layer %d", L), "m s-2", mo.vq)
		add(fmt.Sprintf("uv%d", L), fmt.Sprintf("eddy momentum flux u'v', layer %d", L), "m2 s-2", mo.uv)
		add(fmt.Sprintf("eke%d", L), fmt.Sprintf("eddy kinetic energy, layer %d", L), "m2 s-2", eke)
		add(fmt.Sprintf("ex%d", L), fmt.Sprintf("E-vector zonal component v'2 - u'2, layer %d", L), "m2 s-2", ex)
		add(fmt.Sprintf("ey%d", L), fmt.Sprintf("E-vector meridional component -u'v', layer %d", L), "m2 s-2", ey)
		parts := []struct {
			suffix, long string
			conv, psit   []complex128
		}{
			{"", "eddy PV flux", an.conv[n], an.psit[n]},
			{"_vort", "eddy relative-vorticity flux", an.convZ[n], an.psitZ[n]},
			{"_interface", "eddy interface (thickness) flux", an.conv2[n], an.psit2[n]},
		}
		for _, p := range parts {
			add(fmt.Sprintf("conv%s%d", p.suffix, L), fmt.Sprintf("convergence of the %s, layer %d", p.long, L), "s-2", grid(p.conv))
		}
		for _, p := range parts {
			add(fmt.Sprintf("psit%s%d", p.suffix, L), fmt.Sprintf("streamfunction tendency of the %s convergence, layer %d", p.long, L), "m2 s-2", grid(p.psit))
		}
		for _, p := range parts {
			add(fmt.Sprintf("zt%s%d", p.suffix, L), fmt.Sprintf("height tendency f0 psi_t/g of the %s convergence, layer %d", p.long, L), "m day-1", scaled(grid(p.psit), zc))
		}
		if a.pat[0] != nil {
			add(fmt.Sprintf("pattern%d", L), fmt.Sprintf("projection pattern (block streamfunction), layer %d", L), "m2 s-1", grid(a.pat[n]))
		}
	}
	hf := a.heatFlux(an)
	add("heat_flux", "eddy heat flux v'(psi1 - psi2)' with the mass-weighted v", "m3 s-2", hf)
	add("heat_flux_k", "eddy heat flux v'T' between the layers' mid-levels", "K m s-1", scaled(hf, a.kelvinPerPsi()))
	return f
}

// EddyForcing sets, cheaply enough for a live display, the gridded eddy PV
// flux convergence C_n of the window so far (conv, s⁻²) and its height
// tendency f0 ψ_t/g (height, m day⁻¹), each pair only if not nil; they are
// the fields conv1, conv2 and zt1, zt2 of Fields. Without samples they are
// zero.
func (a *Accumulator) EddyForcing(conv, height [2][]float64) error {
	np := len(a.tau)
	for n := range 2 {
		if conv[n] != nil && len(conv[n]) != np || height[n] != nil && len(height[n]) != np {
			return fmt.Errorf("diag: EddyForcing: layer %d needs %d×%d points", n+1, a.g.Ny, a.g.Nx)
		}
	}
	if a.n == 0 {
		for n := range 2 {
			clear(conv[n])
			clear(height[n])
		}
		return nil
	}
	ns := a.g.Len()
	c := [2][]complex128{make([]complex128, ns), make([]complex128, ns)}
	w := 1 / float64(a.n)
	fx, fy := make([]float64, np), make([]float64, np)
	for n := range 2 {
		for i := range fx {
			cl := &a.cells[n][i]
			fx[i], fy[i] = cl.uq*w, cl.vq*w
			if a.raw {
				fx[i] += cl.mu * cl.mq
				fy[i] += cl.mv * cl.mq
			}
		}
		a.convergence(c[n], fx, fy)
		if conv[n] != nil {
			a.plan.Inverse(conv[n], c[n])
		}
	}
	if height[0] != nil || height[1] != nil {
		ps := a.streamTendency(c)
		zc := a.cfg.F0 / qg.Gravity * day
		for n := range 2 {
			if height[n] != nil {
				a.plan.Inverse(height[n], ps[n])
				for i := range height[n] {
					height[n][i] *= zc
				}
			}
		}
	}
	return nil
}
