package sweep

import (
	"fmt"
	"math"
	"strconv"
	"strings"

	"github.com/eddyblock/eddyblock/experiment"
	"github.com/eddyblock/eddyblock/output"
	"github.com/eddyblock/eddyblock/output/netcdf"
)

// ncName turns a configuration key into a NetCDF variable name of letters,
// digits and underscores (wavemaker.mask.patches[1].y →
// wavemaker_mask_patches_1_y).
func ncName(key string) string {
	var b strings.Builder
	for _, r := range key {
		switch {
		case r >= 'a' && r <= 'z', r >= 'A' && r <= 'Z', r >= '0' && r <= '9', r == '_':
			b.WriteRune(r)
		case r == ']':
		default:
			b.WriteByte('_')
		}
	}
	return b.String()
}

// WriteNetCDF writes the table to path as a NetCDF file (64-bit offset
// format) on a member dimension: the member index as its coordinate, the
// member's name, state and seed as text, one variable per parameter (a
// number, or text) named after its key, and one per answer with its units
// and long_name, with _FillValue where a member has no answers. CF-1.10
// global attributes, the sweep file and the caution that this is an
// idealised model.
func (t *Table) WriteNetCDF(path string) error {
	n := len(t.Rows)
	if n == 0 {
		return fmt.Errorf("gather: %s: the sweep has no members", path)
	}
	h := netcdf.Header{
		Format: netcdf.Offset64,
		Dims:   []netcdf.Dim{{Name: "member", Len: n}},
		Attrs: []netcdf.Attr{
			{Name: "Conventions", Value: "CF-1.10"},
			{Name: "title", Value: "eddyblock sweep " + strconv.Quote(t.Name) + ": parameters and one-number answers of each member"},
			{Name: "source", Value: output.Version()},
			{Name: "comment", Value: output.Caution},
			{Name: "sweep_file", Value: t.Source},
			{Name: "members_missing", Value: int32(len(t.Missing()))},
		},
	}
	type textVar struct {
		name string
		vals []string
	}
	type numVar struct {
		name string
		vals []float64
	}
	var texts []textVar
	var nums []numVar
	addText := func(name, long string, vals []string, attrs ...netcdf.Attr) {
		width := 1
		for _, v := range vals {
			width = max(width, len(v))
		}
		dim := name + "_strlen"
		h.Dims = append(h.Dims, netcdf.Dim{Name: dim, Len: width})
		h.Vars = append(h.Vars, netcdf.Var{Name: name, Type: netcdf.Char, Dims: []string{"member", dim},
			Attrs: append([]netcdf.Attr{{Name: "long_name", Value: long}}, attrs...)})
		texts = append(texts, textVar{name, vals})
	}
	idx := make([]float64, n)
	names, states, seeds := make([]string, n), make([]string, n), make([]string, n)
	for i, r := range t.Rows {
		idx[i], names[i], states[i], seeds[i] = float64(r.Index), r.Name, r.State, strconv.FormatUint(r.Seed, 10)
	}
	h.Vars = append(h.Vars, netcdf.Var{Name: "member", Type: netcdf.Int, Dims: []string{"member"},
		Attrs: []netcdf.Attr{{Name: "long_name", Value: "index of the sweep member"}}})
	nums = append(nums, numVar{"member", idx})
	addText("member_name", "name of the member's output directory", names)
	addText("state", "state of the member: done, failed, running, interrupted or not run", states)
	addText("seed", "seed of the member's wave source (wavemaker.seed)", seeds)
	used := map[string]bool{"member": true, "member_name": true, "state": true, "seed": true}
	for k, key := range t.Keys {
		name := ncName(key)
		for used[name] {
			name += "_"
		}
		used[name] = true
		attrs := []netcdf.Attr{{Name: "configuration_key", Value: key}}
		long := "configuration key " + key
		if d, ok := experiment.KeyDocFor(key); ok {
			long = d.Meaning + " (configuration key " + key + ")"
		}
		numeric := true
		vals := make([]float64, n)
		for i, r := range t.Rows {
			v, ok := Number(r.Params[k])
			numeric = numeric && ok
			vals[i] = v
		}
		if !numeric {
			text := make([]string, n)
			for i, r := range t.Rows {
				text[i] = plain(r.Params[k])
			}
			addText(name, long, text, attrs...)
			continue
		}
		if u := paramUnits(key); u != "" {
			attrs = append(attrs, netcdf.Attr{Name: "units", Value: u})
		}
		h.Vars = append(h.Vars, netcdf.Var{Name: name, Type: netcdf.Double, Dims: []string{"member"},
			Attrs: append([]netcdf.Attr{{Name: "long_name", Value: long}}, attrs...)})
		nums = append(nums, numVar{name, vals})
	}
	missing := len(t.Missing()) > 0
	for k, a := range t.Answers {
		attrs := []netcdf.Attr{{Name: "long_name", Value: a.LongName}, {Name: "units", Value: a.Units}}
		vals := make([]float64, n)
		for i, r := range t.Rows {
			vals[i] = r.Values[k]
			if math.IsNaN(vals[i]) && !r.Done() {
				vals[i] = netcdf.FillDouble
			}
		}
		if missing {
			attrs = append(attrs, netcdf.Attr{Name: "_FillValue", Value: netcdf.FillDouble})
		}
		h.Vars = append(h.Vars, netcdf.Var{Name: a.Name, Type: netcdf.Double, Dims: []string{"member"}, Attrs: attrs})
		nums = append(nums, numVar{a.Name, vals})
	}
	w, err := netcdf.Create(path, h)
	if err != nil {
		return fmt.Errorf("gather: %w", err)
	}
	for _, v := range nums {
		if err := w.WriteFloat64(v.name, v.vals); err != nil {
			w.Close()
			return fmt.Errorf("gather: %w", err)
		}
	}
	for _, v := range texts {
		d, _ := h.Dim(v.name + "_strlen")
		buf := make([]byte, n*d.Len)
		for i, s := range v.vals {
			copy(buf[i*d.Len:], s)
		}
		if err := w.WriteVar(v.name, buf); err != nil {
			w.Close()
			return fmt.Errorf("gather: %w", err)
		}
	}
	w.SetDurable(true)
	if err := w.Close(); err != nil {
		return fmt.Errorf("gather: %w", err)
	}
	return nil
}
