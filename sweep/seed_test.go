package sweep

import (
	"testing"
)

// TestSplitMix64Reference checks the generator against SplitMix64's
// reference outputs (Steele, Lea & Flood 2014; the first outputs for
// seed 1234567 and for seed 0 from memory, as the reference C
// implementation splitmix64.c prints them).
func TestSplitMix64Reference(t *testing.T) {
	want := []uint64{6457827717110365317, 3203168211198807973, 9817491932198370423, 4593380528125082431, 16408922859458223821}
	state := uint64(1234567)
	for i, w := range want {
		state += golden
		if got := splitmix64(state); got != w {
			t.Errorf("output %d for seed 1234567: %d, want %d", i+1, got, w)
		}
		// MemberSeed(seed, i) is the (i+1)-th output, less its lowest bit
		if got := MemberSeed(1234567, i); got != w>>1 {
			t.Errorf("MemberSeed(1234567, %d) = %d, want %d", i, got, w>>1)
		}
	}
	if got := splitmix64(golden); got != 0xe220a8397b1dcdaf {
		t.Errorf("first output for seed 0: %#x, want 0xe220a8397b1dcdaf", got)
	}
}

// TestMemberSeedsDistinct checks that the member seeds of a sweep are
// distinct, fit a TOML integer (below 2⁶³) and change with the sweep's
// seed, for seeds at the edges of the range (common practice: the members
// of an ensemble must not share a noise realisation).
func TestMemberSeedsDistinct(t *testing.T) {
	const n = 200000
	for _, seed := range []uint64{0, 1, 42, 1<<63 - 1, 1<<64 - 1} {
		seen := make(map[uint64]int, n)
		for i := range n {
			s := MemberSeed(seed, i)
			if s >= 1<<63 {
				t.Fatalf("MemberSeed(%d, %d) = %d does not fit a TOML integer", seed, i, s)
			}
			if j, dup := seen[s]; dup {
				t.Fatalf("seed %d: members %d and %d share the seed %d", seed, j, i, s)
			}
			seen[s] = i
			if i < 100 && s == MemberSeed(seed+1, i) {
				t.Errorf("member %d has the same seed for sweep seeds %d and %d", i, seed, seed+1)
			}
		}
	}
}

// TestMembersGetDerivedSeeds checks that every member's configuration
// carries MemberSeed(seed, index), the same in every expansion of the same
// file, and that a sweep setting wavemaker.seed itself keeps its value.
func TestMembersGetDerivedSeeds(t *testing.T) {
	src := small + `
[vary]
"model.u1" = [14.0, 15.0, 16.0]
`
	a, err := parse(t, src).Expand()
	if err != nil {
		t.Fatal(err)
	}
	b, err := parse(t, src).Expand()
	if err != nil {
		t.Fatal(err)
	}
	if !a.DerivedSeeds {
		t.Error("DerivedSeeds false")
	}
	for i, m := range a.Members {
		want := MemberSeed(11, i)
		if m.Seed != want || m.Config.Wavemaker.Seed != want || b.Members[i].Config.Wavemaker.Seed != want {
			t.Errorf("member %d: seed %d, configuration %d, again %d; want %d", i, m.Seed, m.Config.Wavemaker.Seed, b.Members[i].Config.Wavemaker.Seed, want)
		}
	}
	shared, err := parse(t, small+`
"wavemaker.seed" = 5
[vary]
"model.u1" = [14.0, 16.0]
`).Expand()
	if err != nil {
		t.Fatal(err)
	}
	if shared.DerivedSeeds {
		t.Error("DerivedSeeds true with wavemaker.seed in [fixed]")
	}
	for i, m := range shared.Members {
		if m.Config.Wavemaker.Seed != 5 || m.Seed != 5 {
			t.Errorf("member %d: seed %d, want the fixed 5", i, m.Config.Wavemaker.Seed)
		}
	}
}
