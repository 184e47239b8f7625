// Package settings flattens a configuration into the key = value pairs a
// configuration file would hold ("model.dt" = "900",
// "wavemaker.mask.patches[1].x" = "1.1e+07"), so that two configurations can
// be compared key by key: a restart file records the settings of the run
// that wrote it, and a restart with different settings is refused with a
// message naming each differing key.
package settings

import (
	"bytes"
	"fmt"
	"slices"
	"sort"
	"strconv"
	"strings"

	"github.com/BurntSushi/toml"
)

// Flatten returns the TOML keys of v (a struct with toml tags) and their
// values, formatted exactly (floats with the fewest digits that read back to
// the same bits). Keys of nested tables are joined by dots and array
// elements indexed as key[i], with prefix before every key.
func Flatten(v any, prefix string) (map[string]string, error) {
	var b bytes.Buffer
	if err := toml.NewEncoder(&b).Encode(v); err != nil {
		return nil, fmt.Errorf("settings: %w", err)
	}
	var tree map[string]any
	if _, err := toml.Decode(b.String(), &tree); err != nil {
		return nil, fmt.Errorf("settings: %w", err)
	}
	flat := map[string]string{}
	flatten(flat, "", tree)
	out := make(map[string]string, len(flat))
	for k, v := range flat {
		out[prefix+k] = v
	}
	return out, nil
}

func flatten(out map[string]string, key string, v any) {
	switch x := v.(type) {
	case map[string]any:
		for k, e := range x {
			if key != "" {
				k = key + "." + k
			}
			flatten(out, k, e)
		}
	case []map[string]any:
		out[key+".len"] = strconv.Itoa(len(x))
		for i, e := range x {
			flatten(out, fmt.Sprintf("%s[%d]", key, i), e)
		}
	case []any:
		out[key+".len"] = strconv.Itoa(len(x))
		for i, e := range x {
			flatten(out, fmt.Sprintf("%s[%d]", key, i), e)
		}
	case float64:
		out[key] = strconv.FormatFloat(x, 'g', -1, 64)
	case string:
		out[key] = strconv.Quote(x)
	default:
		out[key] = fmt.Sprint(x)
	}
}

// A Change is a key whose value differs between two settings; Old or New is
// empty when the key is missing on that side.
type Change struct {
	Key      string
	Old, New string
}

func (c Change) String() string {
	old, new := c.Old, c.New
	if old == "" {
		old = "(absent)"
	}
	if new == "" {
		new = "(absent)"
	}
	return fmt.Sprintf("%s: %s → %s", c.Key, old, new)
}

// Diff returns the keys whose values differ between old and new, sorted,
// ignoring the keys listed in ignore.
func Diff(old, new map[string]string, ignore ...string) []Change {
	var keys []string
	for k := range old {
		keys = append(keys, k)
	}
	for k := range new {
		if _, ok := old[k]; !ok {
			keys = append(keys, k)
		}
	}
	sort.Strings(keys)
	var out []Change
	for _, k := range keys {
		if slices.Contains(ignore, k) {
			continue
		}
		if a, b := old[k], new[k]; a != b {
			out = append(out, Change{k, a, b})
		}
	}
	return out
}

// Describe lists changes one per line, indented, for an error message.
func Describe(changes []Change) string {
	lines := make([]string, len(changes))
	for i, c := range changes {
		lines[i] = "  " + c.String()
	}
	return strings.Join(lines, "\n")
}
