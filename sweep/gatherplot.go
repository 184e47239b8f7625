package sweep

import (
	"cmp"
	"fmt"
	"slices"
	"strconv"
	"strings"

	"github.com/eddyblock/eddyblock/experiment"
	"github.com/eddyblock/eddyblock/output/figure"
)

// PlotOptions choose what a gathered table's figure shows.
type PlotOptions struct {
	X  string // a numeric parameter (a varied key): the abscissa
	Y  string // an answer (a column name, e.g. eddy_per_day) or a numeric parameter
	By string // a parameter: one line per value ("" for one line)
	// Where fixes other varied keys to one value each, written as in the
	// table (e.g. "model.u1" = "16"), when the sweep varies more keys than
	// X and By.
	Where map[string]string
	LogX  bool
}

// Figure returns the plot of answer Y against parameter X, one line per
// value of parameter By, from the members that are done. Members sharing
// X and By (because the sweep varies another key) must be told apart with
// Where.
func (t *Table) Figure(o PlotOptions) (*figure.XY, error) {
	xi := t.param(o.X)
	if xi < 0 {
		return nil, fmt.Errorf("gather: -x %q is not a varied key of the sweep (they are %s)", o.X, strings.Join(t.Keys, ", "))
	}
	yAnswer, yParam := t.answer(o.Y), t.param(o.Y)
	if yAnswer < 0 && yParam < 0 {
		names := make([]string, len(t.Answers))
		for i, a := range t.Answers {
			names[i] = a.Name
		}
		return nil, fmt.Errorf("gather: -y %q is neither an answer (%s) nor a varied key", o.Y, strings.Join(names, ", "))
	}
	bi := -1
	if o.By != "" {
		if bi = t.param(o.By); bi < 0 {
			return nil, fmt.Errorf("gather: -by %q is not a varied key of the sweep (they are %s)", o.By, strings.Join(t.Keys, ", "))
		}
		if bi == xi {
			return nil, fmt.Errorf("gather: -by %q is the abscissa too", o.By)
		}
	}
	for k, v := range o.Where {
		if t.param(k) < 0 {
			return nil, fmt.Errorf("gather: -where %s=%s: %s is not a varied key of the sweep", k, v, k)
		}
	}
	type point struct{ x, y float64 }
	lines := map[string][]point{}
	var order []string
	seen := map[string]Row{}
	for _, r := range t.Rows {
		if !r.Done() {
			continue
		}
		skip := false
		for k, v := range o.Where {
			if plain(r.Params[t.param(k)]) != v {
				skip = true
			}
		}
		if skip {
			continue
		}
		x, ok := Number(r.Params[xi])
		if !ok {
			return nil, fmt.Errorf("gather: -x %s: value %s is not a number", o.X, plain(r.Params[xi]))
		}
		var y float64
		if yAnswer >= 0 {
			y = r.Values[yAnswer]
		} else if y, ok = Number(r.Params[yParam]); !ok {
			return nil, fmt.Errorf("gather: -y %s: value %s is not a number", o.Y, plain(r.Params[yParam]))
		}
		label := ""
		if bi >= 0 {
			label = o.By + " = " + plain(r.Params[bi])
		}
		id := label + "\x00" + plain(r.Params[xi])
		if prev, dup := seen[id]; dup {
			var others []string
			for k, key := range t.Keys {
				if k != xi && k != bi && o.Where[key] == "" && plain(prev.Params[k]) != plain(r.Params[k]) {
					others = append(others, key)
				}
			}
			return nil, fmt.Errorf("gather: members %d and %d have the same %s and %s; choose one value of %s with -where KEY=VALUE",
				prev.Index, r.Index, o.X, cmp.Or(o.By, "line"), strings.Join(others, ", "))
		}
		seen[id] = r
		if _, ok := lines[label]; !ok {
			order = append(order, label)
		}
		lines[label] = append(lines[label], point{x, y})
	}
	if len(order) == 0 {
		return nil, fmt.Errorf("gather: no finished member to plot")
	}
	ylabel := withUnits(o.Y, paramUnits(o.Y))
	if yAnswer >= 0 {
		ylabel = withUnits(t.Answers[yAnswer].Name, t.Answers[yAnswer].Units)
	}
	f := &figure.XY{Title: t.Name, XLabel: withUnits(o.X, paramUnits(o.X)), YLabel: ylabel, LogX: o.LogX}
	for _, label := range order {
		pts := lines[label]
		slices.SortStableFunc(pts, func(a, b point) int { return cmp.Compare(a.x, b.x) })
		l := figure.Line{Label: label}
		for _, p := range pts {
			l.X, l.Y = append(l.X, p.x), append(l.Y, p.y)
		}
		f.Lines = append(f.Lines, l)
	}
	return f, nil
}

// paramUnits returns the units of a configuration key (UDUNITS), or "".
func paramUnits(key string) string {
	d, ok := experiment.KeyDocFor(key)
	if !ok {
		return ""
	}
	return d.Unit
}

// withUnits writes "name (units)" with the units' exponents as
// superscripts ("day-1" → "day⁻¹"), or name alone for no units or "1".
func withUnits(name, units string) string {
	if units == "" || units == "1" {
		return name
	}
	return name + " (" + prettyUnits(units) + ")"
}

// prettyUnits writes the integer exponents of UDUNITS symbols ("m2 s-3")
// as superscripts ("m² s⁻³").
func prettyUnits(u string) string {
	const sup = "⁰¹²³⁴⁵⁶⁷⁸⁹"
	digits := []rune(sup)
	fields := strings.Fields(u)
	for i, f := range fields {
		j := strings.IndexAny(f, "-0123456789")
		if j <= 0 {
			continue
		}
		exp := f[j:]
		if _, err := strconv.Atoi(exp); err != nil {
			continue
		}
		var b strings.Builder
		b.WriteString(f[:j])
		for _, r := range exp {
			if r == '-' {
				b.WriteRune('⁻')
			} else {
				b.WriteRune(digits[r-'0'])
			}
		}
		fields[i] = b.String()
	}
	return strings.Join(fields, " ")
}
