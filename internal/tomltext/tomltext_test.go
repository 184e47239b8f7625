package tomltext

import (
	"math"
	"strconv"
	"testing"

	"github.com/BurntSushi/toml"
)

// TestFloatExact checks that the floats written read back to the
// same bits through the TOML decoder, for values that need all 17 digits,
// the extremes of float64 and negative zero (IEEE 754 binary64; TOML 1.0
// float syntax).
func TestFloatExact(t *testing.T) {
	for _, f := range []float64{0, math.Copysign(0, -1), 1, 256, 700000, 1e21, 0.1, 1.0 / 3, 2.3148148148148148e-06,
		1 / (0.5 * 86400), 5e-324, math.SmallestNonzeroFloat64 * 3, math.MaxFloat64, -1.6e-11, 123456789012345678} {
		s := Float(f)
		var v struct {
			F float64 `toml:"f"`
		}
		if _, err := toml.Decode("f = "+s, &v); err != nil {
			t.Errorf("%v written as %q: %v", f, s, err)
			continue
		}
		if math.Float64bits(v.F) != math.Float64bits(f) {
			t.Errorf("%v written as %q reads back as %v", f, s, v.F)
		}
		if g, err := strconv.ParseFloat(s, 64); err != nil || g != f {
			t.Errorf("%q: strconv reads %v, %v", s, g, err)
		}
	}
	for _, f := range []float64{math.NaN(), math.Inf(1), math.Inf(-1)} {
		var v struct {
			F float64 `toml:"f"`
		}
		if _, err := toml.Decode("f = "+Float(f), &v); err != nil || (v.F != f && !(math.IsNaN(f) && math.IsNaN(v.F))) {
			t.Errorf("%v: read back as %v, %v", f, v.F, err)
		}
	}
}

// TestString checks that names with quotes, backslashes, control
// characters and non-ASCII letters are written as TOML basic strings that
// read back unchanged.
func TestString(t *testing.T) {
	for _, s := range []string{"", "plain", `a "quoted" \ name`, "tab\tnew\nline\x01\x7f", "ψ and q — a block"} {
		var v struct {
			S string `toml:"s"`
		}
		if _, err := toml.Decode("s = "+String(s), &v); err != nil || v.S != s {
			t.Errorf("%q written as %s reads back as %q, %v", s, String(s), v.S, err)
		}
	}
}

// TestStringNoGoEscapes checks characters for which Go's quoting writes
// escapes that TOML 1.0 does not have (\x, \a, \v): the text must still
// read back (TOML 1.0, basic strings).
func TestStringNoGoEscapes(t *testing.T) {
	for _, s := range []string{"\x00", "bell\a", "vtab\v", "del\x7f", "\u2028 line separator"} {
		var v struct {
			S string `toml:"s"`
		}
		if _, err := toml.Decode("s = "+String(s), &v); err != nil || v.S != s {
			t.Errorf("%q written as %s reads back as %q, %v", s, String(s), v.S, err)
		}
	}
}
