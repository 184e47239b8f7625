package diag

import (
	"bytes"
	"encoding/gob"
	"fmt"

	"github.com/eddyblock/eddyblock/qg"
)

// accVersion is the version of the encoding of an Accumulator's state.
const accVersion = 1

// cellFields is the number of float64 fields of a cell, in the order
// encoded by MarshalBinary.
const cellFields = 13

// accState is the encoded running state of an Accumulator: everything a
// restarted run needs to continue the averages, the series and the index
// statistics as if it had not stopped, and what identifies the grid and
// the options they were accumulated with.
type accState struct {
	Version   int
	Nx, Ny    int
	Spinup    float64
	Norm      Norm
	Transient bool

	N                         int
	MPsi                      [2][]float64
	Cells                     [2][]float64 // cellFields numbers per grid point
	SMean, FMean, First, Last [2][]complex128
	S11, S22, S12             []float64
	TFirst, TLast, LastT      float64
	LastLedger                qg.Ledger
	Sampled                   bool
	Series                    Series
}

// MarshalBinary returns the accumulator's running state (encoding.BinaryMarshaler),
// to be stored beside a model checkpoint: UnmarshalBinary on an accumulator
// made for the restored model with the same options continues the
// diagnostics bit for bit.
func (a *Accumulator) MarshalBinary() ([]byte, error) {
	s := accState{
		Version: accVersion, Nx: a.g.Nx, Ny: a.g.Ny,
		Spinup: a.opt.Spinup, Norm: a.opt.Norm, Transient: a.opt.Transient,
		N: a.n, MPsi: a.mPsi,
		SMean: a.sMean, FMean: a.fMean, First: a.first, Last: a.last,
		S11: a.s11, S22: a.s22, S12: a.s12,
		TFirst: a.tFirst, TLast: a.tLast, LastT: a.lastT,
		LastLedger: a.lastLedger, Sampled: a.sampled, Series: a.series,
	}
	for n := range 2 {
		f := make([]float64, 0, cellFields*len(a.cells[n]))
		for _, c := range a.cells[n] {
			f = append(f, c.mu, c.mv, c.mz, c.mq, c.uu, c.vv, c.uv, c.uz, c.vz, c.ut, c.vt, c.uq, c.vq)
		}
		s.Cells[n] = f
	}
	var b bytes.Buffer
	if err := gob.NewEncoder(&b).Encode(&s); err != nil {
		return nil, fmt.Errorf("diag: encoding the accumulator: %w", err)
	}
	return b.Bytes(), nil
}

// UnmarshalBinary replaces the accumulator's running state with one written
// by MarshalBinary (encoding.BinaryUnmarshaler). It returns an error, and
// leaves the accumulator unchanged, if the data are damaged or were
// accumulated on another grid or with other options.
func (a *Accumulator) UnmarshalBinary(data []byte) error {
	var s accState
	if err := gob.NewDecoder(bytes.NewReader(data)).Decode(&s); err != nil {
		return fmt.Errorf("diag: decoding the accumulator: %w", err)
	}
	switch {
	case s.Version != accVersion:
		return fmt.Errorf("diag: accumulator state of version %d, this program reads version %d", s.Version, accVersion)
	case s.Nx != a.g.Nx || s.Ny != a.g.Ny:
		return fmt.Errorf("diag: accumulator state of a %d×%d grid, the model's is %d×%d", s.Nx, s.Ny, a.g.Nx, a.g.Ny)
	case s.Spinup != a.opt.Spinup:
		return fmt.Errorf("diag: accumulator state with a spin-up of %g s, the options say %g s", s.Spinup, a.opt.Spinup)
	case s.Norm != a.opt.Norm:
		return fmt.Errorf("diag: accumulator state with the %q norm, the options say %q", s.Norm, a.opt.Norm)
	case s.Transient != a.opt.Transient:
		return fmt.Errorf("diag: accumulator state with Transient = %t, the options say %t", s.Transient, a.opt.Transient)
	}
	np, ns := a.g.Nx*a.g.Ny, a.g.Len()
	for n := range 2 {
		if len(s.MPsi[n]) != np || len(s.Cells[n]) != cellFields*np ||
			len(s.SMean[n]) != ns || len(s.FMean[n]) != ns || len(s.First[n]) != ns || len(s.Last[n]) != ns {
			return fmt.Errorf("diag: accumulator state has fields of the wrong size for layer %d", n+1)
		}
	}
	if len(s.S11) != ns || len(s.S22) != ns || len(s.S12) != ns {
		return fmt.Errorf("diag: accumulator state has spectral co-moments of the wrong size")
	}
	for n := range 2 {
		copy(a.mPsi[n], s.MPsi[n])
		f := s.Cells[n]
		for i := range a.cells[n] {
			c := f[cellFields*i : cellFields*(i+1)]
			a.cells[n][i] = cell{c[0], c[1], c[2], c[3], c[4], c[5], c[6], c[7], c[8], c[9], c[10], c[11], c[12]}
		}
		copy(a.sMean[n], s.SMean[n])
		copy(a.fMean[n], s.FMean[n])
		copy(a.first[n], s.First[n])
		copy(a.last[n], s.Last[n])
	}
	copy(a.s11, s.S11)
	copy(a.s22, s.S22)
	copy(a.s12, s.S12)
	a.n = s.N
	a.tFirst, a.tLast, a.lastT = s.TFirst, s.TLast, s.LastT
	a.lastLedger, a.sampled = s.LastLedger, s.Sampled
	a.series = s.Series
	if a.series.Rates == nil {
		a.series.Rates = make(map[string][]float64, qg.NumTerms)
	}
	return nil
}
