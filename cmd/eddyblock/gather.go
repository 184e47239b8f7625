package main

import (
	"bytes"
	"errors"
	"flag"
	"fmt"
	"io"
	"math"
	"os"
	"path/filepath"
	"strings"

	"github.com/eddyblock/eddyblock/output/figure"
	"github.com/eddyblock/eddyblock/sweep"
)

const gatherUsage = `usage:
  eddyblock gather DIR [-csv FILE] [-nc FILE] [-x KEY -y ANSWER [-by KEY] [-where KEY=VALUE,...] [-logx] [-png FILE]]

Writes one table of every member of the sweep in DIR, its parameters and
one-number answers (DIR/gathered.csv and DIR/gathered.nc unless -csv/-nc
say otherwise), and with -x and -y a figure of an answer against a
parameter, one line per value of -by (DIR/ANSWER_vs_KEY.png unless -png).
Members that are not finished are listed, with their state, and have empty
answers.`

// The files gather writes into the sweep directory by default.
const (
	gatheredCSV = "gathered.csv"
	gatheredNC  = "gathered.nc"
)

// cmdGather gathers a sweep directory's members into one table (CSV and
// NetCDF) and, if asked, a figure.
func cmdGather(args []string, stdout, stderr io.Writer) error {
	fs := flag.NewFlagSet("gather", flag.ContinueOnError)
	fs.SetOutput(stderr)
	fs.Usage = func() { fmt.Fprintln(stderr, gatherUsage); fs.PrintDefaults() }
	csvPath := fs.String("csv", "", "CSV table (default DIR/"+gatheredCSV+")")
	ncPath := fs.String("nc", "", "NetCDF table (default DIR/"+gatheredNC+")")
	x := fs.String("x", "", "figure: the parameter (a varied key) on the abscissa")
	y := fs.String("y", "", "figure: the answer (a column name, e.g. eddy_per_day) on the ordinate")
	by := fs.String("by", "", "figure: one line per value of this varied key")
	where := fs.String("where", "", "figure: fix other varied keys, KEY=VALUE,KEY=VALUE (values as in the table)")
	logx := fs.Bool("logx", false, "figure: logarithmic abscissa")
	pngPath := fs.String("png", "", "figure file (default DIR/ANSWER_vs_KEY.png)")
	quiet := fs.Bool("quiet", false, "do not print the table")
	// the directory may come first or last
	var dir string
	if len(args) > 0 && !strings.HasPrefix(args[0], "-") {
		dir, args = args[0], args[1:]
	}
	if err := fs.Parse(args); err != nil {
		return err
	}
	switch {
	case dir == "" && fs.NArg() == 1:
		dir = fs.Arg(0)
	case dir == "" || fs.NArg() > 0:
		return errors.New("gather takes one sweep directory\n" + gatherUsage)
	}
	if (*x == "") != (*y == "") {
		return errors.New("gather: a figure needs both -x (a varied key) and -y (an answer)")
	}
	if *x == "" && (*by != "" || *where != "" || *logx || *pngPath != "") {
		return errors.New("gather: -by, -where, -logx and -png go with -x and -y")
	}
	t, err := sweep.Gather(dir)
	if err != nil {
		return err
	}
	// the figure is built first, so that a bad -x, -y or -by is refused
	// before anything is written
	var fig *figure.XY
	if *x != "" {
		o := sweep.PlotOptions{X: *x, Y: *y, By: *by, LogX: *logx, Where: map[string]string{}}
		for _, kv := range strings.Split(*where, ",") {
			if strings.TrimSpace(kv) == "" {
				continue
			}
			k, v, ok := strings.Cut(kv, "=")
			if !ok {
				return fmt.Errorf("-where %q: want KEY=VALUE", kv)
			}
			o.Where[strings.TrimSpace(k)] = strings.TrimSpace(v)
		}
		if fig, err = t.Figure(o); err != nil {
			return err
		}
		if *pngPath == "" {
			name := *y + "_vs_" + *x
			if *by != "" {
				name += "_by_" + *by
			}
			*pngPath = filepath.Join(dir, strings.NewReplacer("[", "", "]", "", "/", "_").Replace(name)+".png")
		}
	}
	if *csvPath == "" {
		*csvPath = filepath.Join(dir, gatheredCSV)
	}
	if *ncPath == "" {
		*ncPath = filepath.Join(dir, gatheredNC)
	}
	var csv bytes.Buffer
	if err := t.WriteCSV(&csv); err != nil {
		return err
	}
	if err := replaceFile(*csvPath, func(p string) error { return os.WriteFile(p, csv.Bytes(), 0o644) }); err != nil {
		return fmt.Errorf("-csv: %w", err)
	}
	if err := replaceFile(*ncPath, t.WriteNetCDF); err != nil {
		return fmt.Errorf("-nc: %w", err)
	}
	wrote := []string{*csvPath, *ncPath}
	if fig != nil {
		err := replaceFile(*pngPath, func(p string) error {
			f, err := os.Create(p)
			if err != nil {
				return err
			}
			if err := figure.WritePNG(f, fig, figure.Size{Width: 900, Height: 560}); err != nil {
				f.Close()
				return err
			}
			return f.Close()
		})
		if err != nil {
			return fmt.Errorf("-png: %w", err)
		}
		wrote = append(wrote, *pngPath)
	}
	if !*quiet {
		writeAnswerTable(stdout, t, sweep.Shard{})
	}
	fmt.Fprintf(stdout, "wrote %s\n", strings.Join(wrote, ", "))
	if miss := t.Missing(); len(miss) > 0 {
		fmt.Fprintf(stdout, "%d of %d members missing (no answers in the table):\n", len(miss), len(t.Rows))
		for _, r := range miss {
			line := fmt.Sprintf("  member %d %s: %s", r.Index, r.Name, r.State)
			if r.Note != "" {
				line += ": " + firstLine(r.Note)
			}
			fmt.Fprintln(stdout, line)
		}
	}
	return nil
}

// replaceFile writes a file through write into a temporary file beside
// path, then renames it over path, so that path is whole or as it was.
func replaceFile(path string, write func(string) error) error {
	tmp := path + ".tmp"
	if err := write(tmp); err != nil {
		os.Remove(tmp)
		return err
	}
	if err := os.Rename(tmp, path); err != nil {
		os.Remove(tmp)
		return err
	}
	return nil
}

func firstLine(s string) string {
	line, _, _ := strings.Cut(s, "\n")
	return line
}

// writeAnswerTable prints the members of a shard of a gathered table with
// their parameters and main answers.
func writeAnswerTable(w io.Writer, t *sweep.Table, shard sweep.Shard) {
	cols := []struct{ name, head, format string }{
		{"eddy_per_day", "eddy/day", "%+10.4f"},
		{"eddy_vorticity_per_day", "vort/day", "%+10.4f"},
		{"eddy_interface_per_day", "interf/day", "%+10.4f"},
		{"eddy_vorticity_correlation", "corr", "%+7.3f"},
		{"block_index_mean", "index", "%7.3f"},
		{"eke_upper_m2_per_s2", "EKE1 m2/s2", "%10.3g"},
	}
	index := map[string]int{}
	for i, a := range t.Answers {
		index[a.Name] = i
	}
	width := len("member")
	for _, r := range t.Rows {
		width = max(width, len(r.Name))
	}
	fmt.Fprintf(w, "%-*s", width, "member")
	for _, c := range cols {
		fmt.Fprintf(w, " %*s", len(fmt.Sprintf(c.format, 0.0)), c.head)
	}
	fmt.Fprintln(w)
	for _, r := range t.Rows {
		if !shard.Contains(r.Index) {
			continue
		}
		fmt.Fprintf(w, "%-*s", width, r.Name)
		if !r.Done() {
			fmt.Fprintf(w, " (%s)\n", r.State)
			continue
		}
		for _, c := range cols {
			v := math.NaN()
			if i, ok := index[c.name]; ok {
				v = r.Values[i]
			}
			fmt.Fprintf(w, " "+c.format, v)
		}
		fmt.Fprintln(w)
	}
}
