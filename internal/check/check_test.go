package check

import (
	"errors"
	"math"
	"strings"
	"testing"
)

func TestValidators(t *testing.T) {
	nan, inf := math.NaN(), math.Inf(1)
	for _, tc := range []struct {
		name string
		err  error
		want string // "" for no error
	}{
		{"positive ok", Positive("a", 1e-30), ""},
		{"positive zero", Positive("a", 0), "greater than zero"},
		{"positive NaN", Positive("a", nan), "finite"},
		{"positive Inf", Positive("a", inf), "finite"},
		{"non-negative zero", NonNegative("b", 0), ""},
		{"non-negative below", NonNegative("b", -1e-300), "zero or greater"},
		{"non-negative −Inf", NonNegative("b", -inf), "finite"},
		{"finite", Finite("c", -5), ""},
		{"finite NaN", Finite("c", nan), "finite"},
		{"within", Within("d", 2, 0, 2, "0 to 2"), ""},
		{"within above", Within("d", 2.1, 0, 2, "0 to 2"), "must lie in 0 to 2"},
		{"within NaN", Within("d", nan, 0, 2, "0 to 2"), "must lie in 0 to 2"},
	} {
		if tc.want == "" {
			if tc.err != nil {
				t.Errorf("%s: %v", tc.name, tc.err)
			}
			continue
		}
		var fe *FieldError
		if !errors.As(tc.err, &fe) || !strings.Contains(tc.err.Error(), tc.want) || !strings.HasPrefix(tc.err.Error(), "config: "+fe.Field+" = ") {
			t.Errorf("%s: got %v, want a FieldError with %q", tc.name, tc.err, tc.want)
		}
	}
}
