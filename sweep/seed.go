package sweep

// golden is SplitMix64's increment, 2⁶⁴/φ rounded to an odd integer.
const golden = 0x9e3779b97f4a7c15

// splitmix64 is SplitMix64's output function (Steele, Lea & Flood 2014,
// "Fast splittable pseudorandom number generators", with the mixing
// constants of Stafford's variant 13): a bijection of 64-bit integers.
func splitmix64(z uint64) uint64 {
	z = (z ^ (z >> 30)) * 0xbf58476d1ce4e5b9
	z = (z ^ (z >> 27)) * 0x94d049bb133111eb
	return z ^ (z >> 31)
}

// MemberSeed returns the wave-source seed of member index of a sweep with
// the given seed: the (index+1)-th output of a SplitMix64 generator whose
// state starts at seed, splitmix64(seed + (index+1)·0x9e3779b97f4a7c15),
// shifted right by one bit so that it is a non-negative TOML integer (the
// configuration's wavemaker.seed is written to TOML files).
//
// The seeds depend only on the sweep's seed and the member's index, so a
// member gets the same seed whichever machine, shard or job runs it. The
// states seed + (index+1)·γ differ for different indices (γ is odd) and
// the output function is a bijection, so the 64-bit outputs of one sweep
// are all distinct; dropping one bit leaves two members a 2⁻⁶³ chance of
// sharing a seed.
func MemberSeed(seed uint64, index int) uint64 {
	return splitmix64(seed+uint64(index+1)*golden) >> 1
}
