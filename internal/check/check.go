// Package check holds the validators every configuration in eddyblock
// uses, so that a value out of range gets the same words wherever it is
// found, and the error that names the bad key.
package check

import (
	"fmt"
	"math"
)

// FieldError reports a configuration value that is out of range. Field is
// the configuration key, as written in a configuration file
// ("model.dt", "wavemaker.mask.patches[1].x").
type FieldError struct {
	Field string
	Value any
	Why   string
}

func (e *FieldError) Error() string {
	return fmt.Sprintf("config: %s = %v: %s", e.Field, e.Value, e.Why)
}

// IsFinite reports whether v is neither NaN nor infinite.
func IsFinite(v float64) bool { return !math.IsNaN(v) && !math.IsInf(v, 0) }

// Positive requires a finite v > 0.
func Positive(key string, v float64) error {
	if !IsFinite(v) || v <= 0 {
		return &FieldError{key, v, "must be a finite number greater than zero"}
	}
	return nil
}

// NonNegative requires a finite v ≥ 0.
func NonNegative(key string, v float64) error {
	if !IsFinite(v) || v < 0 {
		return &FieldError{key, v, "must be a finite number, zero or greater"}
	}
	return nil
}

// Finite requires a finite v.
func Finite(key string, v float64) error {
	if !IsFinite(v) {
		return &FieldError{key, v, "must be a finite number"}
	}
	return nil
}

// Within requires a finite v with lo ≤ v ≤ hi; what names the range in the
// message ("the domain, 0 to lx = 2e+07 m").
func Within(key string, v, lo, hi float64, what string) error {
	if !IsFinite(v) || v < lo || v > hi {
		return &FieldError{key, v, "must lie in " + what}
	}
	return nil
}
