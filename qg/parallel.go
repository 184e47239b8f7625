package qg

// scale returns a·z for real a without a full complex multiplication.
func scale(a float64, z complex128) complex128 { return complex(a*real(z), a*imag(z)) }

// mulI returns i·a·z.
func mulI(a float64, z complex128) complex128 { return complex(-a*imag(z), a*real(z)) }

// dot returns Re(conj(a)·b).
func dot(a, b complex128) float64 { return real(a)*real(b) + imag(a)*imag(b) }
