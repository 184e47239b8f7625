package sweep

import (
	"fmt"
	"strconv"
	"strings"
)

// Name limits: a value's label is cut to maxValueLabel bytes and a
// member's name to maxName; the index at the front keeps names unique.
const (
	maxValueLabel = 32
	maxName       = 150
)

// Names returns the directory name of every member: its index, zero-padded
// to the width of the largest (at least three digits), then key=value for
// each varied key, joined by commas, e.g. "003_injection_rate=2e-05,u1=16".
// A key is shortened to its last part ("u1" for model.u1), or to as many
// trailing parts as tell it from the other keys (dipole.height and
// modon.height). Names use only letters, digits and . _ = + , - (any other
// character of a value becomes _), so they are safe on every file system;
// the index keeps them unique, and they sort in the members' order.
func Names(keys []string, values [][]any) []string {
	labels := keyLabels(keys)
	width := max(3, len(strconv.Itoa(len(values)-1)))
	names := make([]string, len(values))
	for i, vals := range values {
		parts := make([]string, len(vals))
		for k, v := range vals {
			parts[k] = labels[k] + "=" + valueLabel(v)
		}
		name := fmt.Sprintf("%0*d_%s", width, i, strings.Join(parts, ","))
		if len(name) > maxName {
			name = name[:maxName]
		}
		names[i] = name
	}
	return names
}

// keyLabels shortens keys to the fewest trailing parts that tell them apart.
func keyLabels(keys []string) []string {
	parts := make([][]string, len(keys))
	for i, k := range keys {
		parts[i] = strings.Split(k, ".")
	}
	labels := make([]string, len(keys))
	for i := range keys {
		for n := 1; n <= len(parts[i]); n++ {
			label := strings.Join(parts[i][len(parts[i])-n:], ".")
			unique := true
			for j := range keys {
				if j == i {
					continue
				}
				pj := parts[j]
				if strings.Join(pj[max(0, len(pj)-n):], ".") == label {
					unique = false
					break
				}
			}
			labels[i] = label
			if unique {
				break
			}
		}
		labels[i] = safe(strings.NewReplacer("[", "", "]", "").Replace(labels[i]))
	}
	return labels
}

// valueLabel writes a value for a directory name: numbers in their
// shortest exact form (2e-05, 16, 1.5e+06), text made safe.
func valueLabel(v any) string {
	var s string
	switch x := v.(type) {
	case float64:
		s = strconv.FormatFloat(x, 'g', -1, 64) // NaN, +Inf, -Inf as such
	case int64:
		s = strconv.FormatInt(x, 10)
	case bool:
		s = strconv.FormatBool(x)
	case string:
		s = x
	case []any:
		p := make([]string, len(x))
		for i, e := range x {
			p[i] = valueLabel(e)
		}
		s = strings.Join(p, "+")
	default:
		s = fmt.Sprint(v)
	}
	s = safe(s)
	if s == "" {
		s = "_"
	}
	if len(s) > maxValueLabel {
		s = s[:maxValueLabel]
	}
	return s
}

// safe replaces every character but ASCII letters, digits and . + - _ by _.
func safe(s string) string {
	var b strings.Builder
	for _, r := range s {
		switch {
		case r >= 'a' && r <= 'z', r >= 'A' && r <= 'Z', r >= '0' && r <= '9', r == '.', r == '+', r == '-', r == '_':
			b.WriteRune(r)
		default:
			b.WriteByte('_')
		}
	}
	out := b.String()
	if strings.Trim(out, ".") == "" && out != "" {
		return strings.Repeat("_", len(out)) // never "." or ".."
	}
	return out
}
