package sweep

import (
	"bytes"
	"errors"
	"fmt"
	"math"
	"strconv"
	"strings"

	"github.com/BurntSushi/toml"

	"github.com/eddyblock/eddyblock/experiment"
)

// SeedKey is the configuration key a sweep derives for every member from
// the sweep's seed, unless the sweep sets it itself.
const SeedKey = "wavemaker.seed"

// MaxMembers is the largest number of members a sweep may have.
const MaxMembers = 100000

// Plan is a sweep expanded into its members, every one validated.
type Plan struct {
	Spec *Spec
	// Name is the sweep's name (Spec.Name, or the base's name + " sweep").
	Name string
	// Base is the base configuration with the sweep's [fixed] keys applied.
	Base experiment.Config
	// Keys are the varied keys: the [vary] lists in order, then those of
	// each [[vary_together]] group.
	Keys []string
	// Members are in the order of the Cartesian product, the last factor
	// varying fastest (as nested loops written in the file's order): the
	// [vary] lists in order, then each [[vary_together]] group as one
	// factor.
	Members []Member
	// DerivedSeeds reports whether each member's wavemaker.seed was derived
	// from Spec.Seed (MemberSeed); false when the sweep sets the key.
	DerivedSeeds bool

	lists [][]any // the values of each key as given, conformed to its type
}

// Member is one run of a sweep.
type Member struct {
	Index int
	// Name is the member's directory name: its index and its values,
	// e.g. "003_injection_rate=2e-05,u1=16" (see Name).
	Name string
	// Values are the member's values of Plan.Keys, in order.
	Values []any
	// Seed is the member's wavemaker.seed.
	Seed uint64
	// Config is the member's whole configuration, validated.
	Config experiment.Config
}

// Expand resolves the base configuration, builds every member's
// configuration and validates each one, before anything runs. An unknown
// key, a value of the wrong type or a value out of range is an error naming
// the key (and the member).
func (s *Spec) Expand() (*Plan, error) {
	if err := s.check(); err != nil {
		return nil, err
	}
	base, err := s.resolveBase()
	if err != nil {
		return nil, err
	}
	tree, err := configTree(base)
	if err != nil {
		return nil, err
	}
	// [fixed] on top of the base
	for _, f := range s.Fixed {
		p, err := parseKey(f.Key)
		if err != nil {
			return nil, fmt.Errorf("sweep: [fixed] %w", err)
		}
		old, err := get(tree, p)
		if err != nil {
			return nil, fmt.Errorf("sweep: [fixed] %w", err)
		}
		v, err := conform(f.Key, old, f.Value)
		if err != nil {
			return nil, fmt.Errorf("sweep: [fixed] %s: %w", f.Key, err)
		}
		tree = set(tree, p, v)
	}
	fixed, err := decodeTree(tree)
	if err != nil {
		return nil, fmt.Errorf("sweep: the base configuration with [fixed]: %w", err)
	}

	// the factors of the product: every [vary] list, then every group
	type factor struct {
		lists []List
		n     int
	}
	var factors []factor
	for _, l := range s.Vary {
		factors = append(factors, factor{[]List{l}, len(l.Values)})
	}
	for _, g := range s.Together {
		factors = append(factors, factor{g, len(g[0].Values)})
	}
	var keys []string
	var paths []path
	var conv [][]any // the values of each key, conformed to the key's type
	for _, f := range factors {
		for _, l := range f.lists {
			p, err := parseKey(l.Key)
			if err != nil {
				return nil, fmt.Errorf("sweep: %w", err)
			}
			old, err := get(tree, p)
			if err != nil {
				return nil, fmt.Errorf("sweep: %w", err)
			}
			vals := make([]any, len(l.Values))
			for i, v := range l.Values {
				if vals[i], err = conform(l.Key, old, v); err != nil {
					return nil, fmt.Errorf("sweep: %s, value %d of %d: %w", l.Key, i+1, len(l.Values), err)
				}
			}
			keys, paths, conv = append(keys, l.Key), append(paths, p), append(conv, vals)
		}
	}
	total := 1
	for _, f := range factors {
		total *= f.n
		if total > MaxMembers {
			return nil, fmt.Errorf("sweep: more than %d members", MaxMembers)
		}
	}

	plan := &Plan{Spec: s, Name: s.Name, Base: fixed, Keys: keys, lists: conv}
	if plan.Name == "" {
		plan.Name = fixed.Name + " sweep"
	}
	plan.DerivedSeeds = true
	for _, k := range keys {
		if k == SeedKey {
			plan.DerivedSeeds = false
		}
	}
	for _, f := range s.Fixed {
		if f.Key == SeedKey {
			plan.DerivedSeeds = false
		}
	}
	seedPath, _ := parseKey(SeedKey)

	values := make([][]any, total)
	for i := range total {
		// the member's position in each factor, the last fastest
		pos := make([]int, len(factors))
		rest := i
		for k := len(factors) - 1; k >= 0; k-- {
			pos[k] = rest % factors[k].n
			rest /= factors[k].n
		}
		var vals []any
		col := 0
		for k, f := range factors {
			for range f.lists {
				vals = append(vals, conv[col][pos[k]])
				col++
			}
		}
		values[i] = vals
	}
	names := Names(keys, values)

	var errs []error
	bad := 0
	for i := range total {
		t := tree
		for k, p := range paths {
			t = set(t, p, values[i][k])
		}
		m := Member{Index: i, Name: names[i], Values: values[i]}
		if plan.DerivedSeeds {
			m.Seed = MemberSeed(s.Seed, i)
			t = set(t, seedPath, int64(m.Seed))
		}
		c, err := decodeTree(t)
		if err == nil {
			c.Name = plan.Name + " " + m.Name
			err = c.Validate()
		}
		if err != nil {
			bad++
			if len(errs) < 5 {
				errs = append(errs, fmt.Errorf("member %d (%s): %w", i, m.Name, err))
			}
			continue
		}
		m.Seed = c.Wavemaker.Seed
		m.Config = c
		plan.Members = append(plan.Members, m)
	}
	if bad > 0 {
		if bad > len(errs) {
			errs = append(errs, fmt.Errorf("and %d more members refused", bad-len(errs)))
		}
		return nil, fmt.Errorf("sweep: %d of %d members refused:\n%w", bad, total, errors.Join(errs...))
	}
	return plan, nil
}

// resolveBase returns the base configuration the Spec names.
func (s *Spec) resolveBase() (experiment.Config, error) {
	switch {
	case s.BaseConfig != nil:
		c := *s.BaseConfig
		if err := c.Validate(); err != nil {
			return experiment.Config{}, fmt.Errorf("sweep: base configuration: %w", err)
		}
		return c, nil
	case s.BaseFile != "":
		c, err := experiment.Load(s.BaseFile)
		if err != nil {
			return experiment.Config{}, fmt.Errorf("sweep: base_file: %w", err)
		}
		return c, nil
	case s.Base != "":
		c, err := experiment.Builtin(s.Base)
		if err != nil {
			return experiment.Config{}, fmt.Errorf("sweep: base: %w", err)
		}
		return c, nil
	}
	return experiment.Default(), nil
}

// configTree returns a configuration as a decoded TOML document: every key
// of the configuration, whether or not its options use it.
func configTree(c experiment.Config) (map[string]any, error) {
	var b bytes.Buffer
	if err := toml.NewEncoder(&b).Encode(c); err != nil {
		return nil, fmt.Errorf("sweep: encoding the base configuration: %w", err)
	}
	var tree map[string]any
	if _, err := toml.Decode(b.String(), &tree); err != nil {
		return nil, fmt.Errorf("sweep: reading the base configuration back: %w", err)
	}
	return tree, nil
}

// decodeTree decodes a configuration document (without validating it).
// The document holds every key of a configuration (configTree), so it is
// decoded into a zero Config: decoding over another configuration would
// write into the lists it shares with it.
func decodeTree(tree map[string]any) (experiment.Config, error) {
	var b bytes.Buffer
	if err := toml.NewEncoder(&b).Encode(tree); err != nil {
		return experiment.Config{}, err
	}
	var c experiment.Config
	md, err := toml.Decode(b.String(), &c)
	if err != nil {
		return experiment.Config{}, err
	}
	if und := md.Undecoded(); len(und) > 0 {
		return experiment.Config{}, fmt.Errorf("unknown key %s", und[0])
	}
	return c, nil
}

// path is a parsed configuration key: table and key names, each with the
// array indices that follow it ("patches[1]").
type path []step

type step struct {
	name  string
	index []int
}

// parseKey parses "wavemaker.mask.patches[1].y".
func parseKey(key string) (path, error) {
	if strings.TrimSpace(key) == "" {
		return nil, errors.New("empty key")
	}
	var p path
	for _, part := range strings.Split(key, ".") {
		name, rest, _ := strings.Cut(part, "[")
		if name == "" {
			return nil, fmt.Errorf("%s: malformed key (want names joined by dots, e.g. model.u1 or wavemaker.mask.patches[1].y)", key)
		}
		st := step{name: name}
		if rest != "" {
			rest = "[" + rest
			for rest != "" {
				if rest[0] != '[' {
					return nil, fmt.Errorf("%s: malformed index", key)
				}
				end := strings.IndexByte(rest, ']')
				if end < 0 {
					return nil, fmt.Errorf("%s: malformed index", key)
				}
				i, err := strconv.Atoi(rest[1:end])
				if err != nil || i < 0 {
					return nil, fmt.Errorf("%s: malformed index %q", key, rest[1:end])
				}
				st.index = append(st.index, i)
				rest = rest[end+1:]
			}
		}
		p = append(p, st)
	}
	return p, nil
}

// get returns the value at p in a configuration document; an error names
// the key and says how it fails to be one.
func get(tree map[string]any, p path) (any, error) {
	var cur any = tree
	var at string
	for k, st := range p {
		m, ok := cur.(map[string]any)
		if !ok {
			return nil, fmt.Errorf("%s: unknown key (%s is a value, not a table)", p, at)
		}
		if k == 0 && st.name == "name" && len(p) == 1 {
			return nil, fmt.Errorf("%s: the sweep names each member itself", p)
		}
		if at != "" {
			at += "."
		}
		at += st.name
		if cur, ok = m[st.name]; !ok {
			return nil, fmt.Errorf("%s: unknown key (the configuration has no %s; `eddyblock config` prints the keys)", p, at)
		}
		for _, i := range st.index {
			var n int
			switch a := cur.(type) {
			case []map[string]any:
				if n = len(a); i < n {
					cur = a[i]
				}
			case []any:
				if n = len(a); i < n {
					cur = a[i]
				}
			default:
				return nil, fmt.Errorf("%s: unknown key (%s is not a list)", p, at)
			}
			if i >= n {
				return nil, fmt.Errorf("%s: unknown key (the base configuration's %s has %d entries)", p, at, n)
			}
			at += fmt.Sprintf("[%d]", i)
		}
	}
	switch cur.(type) {
	case map[string]any, []map[string]any:
		return nil, fmt.Errorf("%s is a table: name one of its keys", p)
	}
	return cur, nil
}

func (p path) String() string {
	var b strings.Builder
	for k, st := range p {
		if k > 0 {
			b.WriteByte('.')
		}
		b.WriteString(st.name)
		for _, i := range st.index {
			fmt.Fprintf(&b, "[%d]", i)
		}
	}
	return b.String()
}

// set returns tree with the value at p replaced by v, copying the tables
// and lists on the way so that tree itself is unchanged.
func set(tree map[string]any, p path, v any) map[string]any {
	return setIn(tree, p, v).(map[string]any)
}

func setIn(cur any, p path, v any) any {
	if len(p) == 0 {
		return v
	}
	m := cur.(map[string]any)
	out := make(map[string]any, len(m))
	for k, e := range m {
		out[k] = e
	}
	out[p[0].name] = setIndex(m[p[0].name], p[0].index, p[1:], v)
	return out
}

func setIndex(cur any, index []int, rest path, v any) any {
	if len(index) == 0 {
		return setIn(cur, rest, v)
	}
	i := index[0]
	switch a := cur.(type) {
	case []map[string]any:
		b := append([]map[string]any(nil), a...)
		b[i] = setIndex(a[i], index[1:], rest, v).(map[string]any)
		return b
	case []any:
		b := append([]any(nil), a...)
		b[i] = setIndex(a[i], index[1:], rest, v)
		return b
	}
	panic("sweep: setIndex on a value that get accepted as a list")
}

// conform returns v as a value of the type of old (the key's value in the
// base configuration), or an error naming the key: integers are accepted
// for numbers, and whole numbers written as floats for integers.
func conform(key string, old, v any) (any, error) {
	wrong := func(want string) error {
		return fmt.Errorf("wrong type: %s is %s, but %s takes %s", literal(v), typeName(v), key, want)
	}
	switch old.(type) {
	case float64:
		switch x := v.(type) {
		case float64:
			return x, nil
		case int64:
			return float64(x), nil
		}
		return nil, wrong("a number")
	case int64:
		switch x := v.(type) {
		case int64:
			return x, nil
		case float64:
			if x == math.Trunc(x) && math.Abs(x) < 1<<62 {
				return int64(x), nil
			}
		}
		return nil, wrong("an integer")
	case string:
		if x, ok := v.(string); ok {
			return x, nil
		}
		return nil, wrong("a string")
	case bool:
		if x, ok := v.(bool); ok {
			return x, nil
		}
		return nil, wrong("true or false")
	case []any:
		if x, ok := v.([]any); ok {
			return x, nil
		}
		return nil, wrong("a list")
	}
	return nil, fmt.Errorf("%s: a key of type %T cannot be swept", key, old)
}

func typeName(v any) string {
	switch x := v.(type) {
	case float64:
		return "a number"
	case int64:
		return "an integer"
	case string:
		return "a string"
	case bool:
		return "a boolean"
	case []any:
		return "a list"
	case map[string]any, []map[string]any:
		return "a table"
	default:
		return fmt.Sprintf("a %T", x)
	}
}
