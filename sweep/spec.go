package sweep

import (
	"bytes"
	"errors"
	"fmt"
	"io"
	"os"
	"path/filepath"
	"slices"
	"strconv"
	"strings"

	"github.com/BurntSushi/toml"

	"github.com/eddyblock/eddyblock/experiment"
	"github.com/eddyblock/eddyblock/internal/tomltext"
)

// Spec is a sweep as a sweep file describes it: a base configuration, keys
// set for every member, and lists of values combined into members.
type Spec struct {
	// Name labels the sweep in reports and gathered files ("" for the
	// base configuration's name followed by " sweep").
	Name string
	// Base names a built-in experiment (experiment.Builtin) to start from,
	// BaseFile a configuration file; at most one of Base, BaseFile and
	// BaseConfig is set, and with none the sweep starts from
	// experiment.Default(). Load resolves a relative BaseFile against the
	// sweep file's directory.
	Base     string
	BaseFile string
	// BaseConfig, for a Go driver, is the base configuration itself.
	BaseConfig *experiment.Config
	// Seed is the sweep's seed, from which every member's wave-source seed
	// is derived (MemberSeed) unless the sweep sets wavemaker.seed itself.
	Seed uint64
	// Fixed are keys set to one value for every member, on top of the base.
	Fixed []Setting
	// Vary are the lists combined as a Cartesian product, each a factor.
	Vary []List
	// Together are groups of lists of equal lengths varied together
	// (zipped): each group is one factor of the product.
	Together [][]List

	// source is the sweep file's text, kept as the copy a sweep directory
	// records ("" when the Spec was built in Go).
	source []byte
}

// Setting is one configuration key set to one value.
type Setting struct {
	Key   string // as in a configuration file: "model.u1", "wavemaker.mask.patches[1].y"
	Value any    // int64, float64, string, bool (TOML's types), or a []any of them
}

// List is a configuration key with the values it takes.
type List struct {
	Key    string
	Values []any
}

// The tables and keys a sweep file holds.
const (
	fileName     = "name"
	fileBase     = "base"
	fileBaseFile = "base_file"
	fileSeed     = "seed"
	fileFixed    = "fixed"
	fileVary     = "vary"
	fileTogether = "vary_together"
)

// Parse reads a sweep file. A relative base_file is kept as written (Load
// resolves it against the file's directory). The keys are checked against
// the configuration and the members built by Expand.
func Parse(r io.Reader) (*Spec, error) {
	src, err := io.ReadAll(r)
	if err != nil {
		return nil, fmt.Errorf("sweep file: %w", err)
	}
	var raw map[string]any
	md, err := toml.Decode(string(src), &raw)
	if err != nil {
		return nil, fmt.Errorf("sweep file: %w", err)
	}
	s := &Spec{source: src, Seed: 1}
	for k, v := range raw {
		switch k {
		case fileName, fileBase, fileBaseFile:
			str, ok := v.(string)
			if !ok {
				return nil, fmt.Errorf("sweep file: %s = %s: want a string", k, literal(v))
			}
			switch k {
			case fileName:
				s.Name = str
			case fileBase:
				s.Base = str
			default:
				s.BaseFile = str
			}
		case fileSeed:
			n, ok := v.(int64)
			if !ok || n < 0 {
				return nil, fmt.Errorf("sweep file: seed = %s: want an integer, zero or more", literal(v))
			}
			s.Seed = uint64(n)
		case fileFixed, fileVary:
			if _, ok := v.(map[string]any); !ok {
				return nil, fmt.Errorf("sweep file: %s must be a table ([%s])", k, k)
			}
		case fileTogether:
			if _, ok := v.([]map[string]any); !ok {
				return nil, fmt.Errorf("sweep file: %s must be an array of tables ([[%s]])", k, k)
			}
		default:
			return nil, fmt.Errorf("sweep file: unknown key %q (a sweep file has %s, %s, %s, %s, [%s], [%s] and [[%s]])",
				k, fileName, fileBase, fileBaseFile, fileSeed, fileFixed, fileVary, fileTogether)
		}
	}
	if s.Base != "" && s.BaseFile != "" {
		return nil, errors.New("sweep file: give base (a built-in experiment) or base_file (a configuration file), not both")
	}
	// The keys in the order the file gives them (md.Keys), so that the
	// members come in the order the file reads.
	for _, key := range md.Keys() {
		if len(key) < 2 {
			continue
		}
		typ := md.Type(key...)
		switch key[0] {
		case fileFixed:
			if typ == "Hash" {
				continue // a sub-table: its keys follow
			}
			v, _ := lookup(raw, key)
			s.Fixed = append(s.Fixed, Setting{Key: strings.Join(key[1:], "."), Value: v})
		case fileVary:
			if typ == "Hash" {
				continue
			}
			name := strings.Join(key[1:], ".")
			v, _ := lookup(raw, key)
			vals, ok := v.([]any)
			if !ok {
				return nil, fmt.Errorf("sweep file: [vary] %s = %s: want a list of values, e.g. [1.0, 2.0]", name, literal(v))
			}
			s.Vary = append(s.Vary, List{Key: name, Values: vals})
		}
	}
	if groups, ok := raw[fileTogether].([]map[string]any); ok {
		s.Together = make([][]List, len(groups))
		// the keys of [[vary_together]] come as vary_together.k1.k2, after
		// each group's header, vary_together
		g := -1
		for _, key := range md.Keys() {
			if key[0] != fileTogether {
				continue
			}
			if len(key) == 1 {
				g++
				continue
			}
			if md.Type(key...) == "Hash" {
				continue
			}
			name := strings.Join(key[1:], ".")
			v, _ := lookupIn(groups[g], key[1:])
			vals, ok := v.([]any)
			if !ok {
				return nil, fmt.Errorf("sweep file: [[vary_together]] group %d: %s = %s: want a list of values", g+1, name, literal(v))
			}
			s.Together[g] = append(s.Together[g], List{Key: name, Values: vals})
		}
	}
	return s, s.check()
}

// Load reads a sweep file; a relative base_file is taken relative to the
// sweep file's directory.
func Load(path string) (*Spec, error) {
	f, err := os.Open(path)
	if err != nil {
		return nil, fmt.Errorf("sweep file: %w", err)
	}
	defer f.Close()
	s, err := Parse(f)
	if err != nil {
		return nil, fmt.Errorf("%s: %w", path, err)
	}
	if s.BaseFile != "" && !filepath.IsAbs(s.BaseFile) {
		s.BaseFile = filepath.Join(filepath.Dir(path), s.BaseFile)
	}
	return s, nil
}

// OneKey is the sweep of one key over values, each written as in a
// configuration file ("1e-5", "\"fixed\"", "true"; a value that is not a
// TOML value is taken as a string), on top of base (a configuration file's
// path, or "" for the built-in default experiment).
func OneKey(baseFile, key string, values []string) (*Spec, error) {
	l := List{Key: strings.TrimSpace(key)}
	for _, v := range values {
		l.Values = append(l.Values, ParseValue(v))
	}
	s := &Spec{BaseFile: baseFile, Seed: 1, Vary: []List{l}}
	return s, s.check()
}

// ParseValue reads one value written as in a configuration file: a TOML
// integer, float, boolean, string or array; anything else is taken as a
// string as written (so that -values fixed,forced works without quotes).
func ParseValue(v string) any {
	v = strings.TrimSpace(v)
	var m map[string]any
	if _, err := toml.Decode("v = "+v, &m); err == nil {
		return m["v"]
	}
	return v
}

// check refuses what no base configuration could make sense of: no list,
// an empty list, lists of a group of different lengths, a key given twice.
func (s *Spec) check() error {
	if len(s.Vary) == 0 && len(s.Together) == 0 {
		return errors.New("sweep: nothing to vary: give at least one list of values in [vary] or [[vary_together]]")
	}
	seen := map[string]string{}
	note := func(key, where string) error {
		if key == "" {
			return fmt.Errorf("sweep: %s: empty key", where)
		}
		if prev, ok := seen[key]; ok {
			return fmt.Errorf("sweep: key %s is given twice (%s and %s)", key, prev, where)
		}
		seen[key] = where
		return nil
	}
	for _, f := range s.Fixed {
		if err := note(f.Key, "[fixed]"); err != nil {
			return err
		}
	}
	for _, l := range s.Vary {
		if err := note(l.Key, "[vary]"); err != nil {
			return err
		}
		if len(l.Values) == 0 {
			return fmt.Errorf("sweep: [vary] %s: empty list of values", l.Key)
		}
	}
	for g, group := range s.Together {
		if len(group) == 0 {
			return fmt.Errorf("sweep: [[vary_together]] group %d has no list", g+1)
		}
		for _, l := range group {
			if err := note(l.Key, fmt.Sprintf("[[vary_together]] group %d", g+1)); err != nil {
				return err
			}
			if len(l.Values) == 0 {
				return fmt.Errorf("sweep: [[vary_together]] group %d: %s: empty list of values", g+1, l.Key)
			}
			if len(l.Values) != len(group[0].Values) {
				return fmt.Errorf("sweep: [[vary_together]] group %d: %s has %d values but %s has %d; lists varied together need equal lengths",
					g+1, l.Key, len(l.Values), group[0].Key, len(group[0].Values))
			}
		}
	}
	n := 0
	if s.Base != "" {
		n++
	}
	if s.BaseFile != "" {
		n++
	}
	if s.BaseConfig != nil {
		n++
	}
	if n > 1 {
		return errors.New("sweep: give one base: a built-in experiment (base), a configuration file (base_file) or a configuration (BaseConfig)")
	}
	return nil
}

// lookup returns the value at key in a decoded TOML document.
func lookup(doc map[string]any, key []string) (any, bool) {
	return lookupIn(doc, key)
}

func lookupIn(doc map[string]any, key []string) (any, bool) {
	var cur any = doc
	for _, k := range key {
		m, ok := cur.(map[string]any)
		if !ok {
			return nil, false
		}
		if cur, ok = m[k]; !ok {
			return nil, false
		}
	}
	return cur, true
}

// TOML returns the sweep as a sweep file (without the text a file had: its
// comments and layout are not kept).
func (s *Spec) TOML() string {
	var b bytes.Buffer
	if s.Name != "" {
		fmt.Fprintf(&b, "%s = %s\n", fileName, literal(s.Name))
	}
	if s.Base != "" {
		fmt.Fprintf(&b, "%s = %s\n", fileBase, literal(s.Base))
	}
	if s.BaseFile != "" {
		fmt.Fprintf(&b, "%s = %s\n", fileBaseFile, literal(s.BaseFile))
	}
	if s.BaseConfig != nil {
		fmt.Fprintf(&b, "# base: a configuration given in Go (%q)\n", s.BaseConfig.Name)
	}
	fmt.Fprintf(&b, "%s = %d\n", fileSeed, s.Seed)
	if len(s.Fixed) > 0 {
		fmt.Fprintf(&b, "\n[%s]\n", fileFixed)
		for _, f := range s.Fixed {
			fmt.Fprintf(&b, "%q = %s\n", f.Key, literal(f.Value))
		}
	}
	if len(s.Vary) > 0 {
		fmt.Fprintf(&b, "\n[%s]\n", fileVary)
		for _, l := range s.Vary {
			fmt.Fprintf(&b, "%q = %s\n", l.Key, literal(l.Values))
		}
	}
	for _, g := range s.Together {
		fmt.Fprintf(&b, "\n[[%s]]\n", fileTogether)
		for _, l := range g {
			fmt.Fprintf(&b, "%q = %s\n", l.Key, literal(l.Values))
		}
	}
	return b.String()
}

// Source returns the text of the sweep file the Spec was read from, or its
// TOML form when it was built in Go.
func (s *Spec) Source() []byte {
	if s.source != nil {
		return slices.Clone(s.source)
	}
	return []byte(s.TOML())
}

// literal writes a value as a TOML literal: floats always with a decimal
// point or exponent, so that they read back as floats.
func literal(v any) string {
	switch x := v.(type) {
	case string:
		return tomltext.String(x)
	case bool:
		return strconv.FormatBool(x)
	case int64:
		return strconv.FormatInt(x, 10)
	case int:
		return strconv.Itoa(x)
	case float64:
		return tomltext.Float(x)
	case []any:
		parts := make([]string, len(x))
		for i, e := range x {
			parts[i] = literal(e)
		}
		return "[" + strings.Join(parts, ", ") + "]"
	case map[string]any:
		return "{…}"
	}
	return fmt.Sprint(v)
}
