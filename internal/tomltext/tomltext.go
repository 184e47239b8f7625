// Package tomltext writes values as TOML 1.0 literals that read back
// exactly: floats to the same bits, strings to the same text. The
// configuration's documented form (package experiment) and the sweep
// files (package sweep) both use it.
package tomltext

import (
	"fmt"
	"math"
	"strconv"
	"strings"
)

// Float writes f exactly: the fewest digits that read back to the same
// float64 (strconv's 'g' format), with ".0" added where TOML needs a
// fraction or an exponent to read a float.
func Float(f float64) string {
	switch {
	case math.IsNaN(f):
		return "nan"
	case math.IsInf(f, 1):
		return "inf"
	case math.IsInf(f, -1):
		return "-inf"
	}
	s := strconv.FormatFloat(f, 'g', -1, 64)
	if !strings.ContainsAny(s, ".e") {
		s += ".0"
	}
	return s
}

// String writes s as a TOML basic string.
func String(s string) string {
	var b strings.Builder
	b.WriteByte('"')
	for _, r := range s {
		switch {
		case r == '"':
			b.WriteString(`\"`)
		case r == '\\':
			b.WriteString(`\\`)
		case r == '\n':
			b.WriteString(`\n`)
		case r == '\t':
			b.WriteString(`\t`)
		case r == '\r':
			b.WriteString(`\r`)
		case r < 0x20 || r == 0x7f:
			fmt.Fprintf(&b, `\u%04X`, r)
		default:
			b.WriteRune(r)
		}
	}
	b.WriteByte('"')
	return b.String()
}
