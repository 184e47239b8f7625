package main

import (
	"errors"
	"flag"
	"fmt"
	"io"
	"path/filepath"
	"runtime"
	"strings"
	"sync"

	"github.com/eddyblock/eddyblock/experiment"
	"github.com/eddyblock/eddyblock/output"
)

// sweepMember is one run of a sweep: the value of the swept key and its
// configuration.
type sweepMember struct {
	value string
	cfg   experiment.Config
}

// sweepMembers builds one configuration per value by decoding "key = value"
// on top of base, so every key a configuration file accepts can be swept and
// is validated as in a file.
func sweepMembers(base experiment.Config, key string, values []string) ([]sweepMember, error) {
	table, name := "", key
	if dot := strings.LastIndex(key, "."); dot >= 0 {
		table, name = "["+key[:dot]+"]\n", key[dot+1:]
	}
	members := make([]sweepMember, len(values))
	for i, v := range values {
		v = strings.TrimSpace(v)
		c, err := experiment.Decode(strings.NewReader(fmt.Sprintf("%s%s = %s\n", table, name, v)), base)
		if err != nil {
			return nil, fmt.Errorf("sweep %s = %s: %w", key, v, err)
		}
		c.Name = fmt.Sprintf("%s %s=%s", base.Name, key, v)
		members[i] = sweepMember{v, c}
	}
	return members, nil
}

// cmdSweep runs the experiment once per value of one configuration key, in
// parallel, and prints a table of the one-number answers. With -member it
// runs a single member, for a cluster's job array.
func cmdSweep(args []string, stdout, stderr io.Writer) error {
	fs := flag.NewFlagSet("sweep", flag.ContinueOnError)
	fs.SetOutput(stderr)
	cfgPath := fs.String("config", "", "TOML configuration file (default: the built-in experiment)")
	key := fs.String("key", "", "configuration key to sweep, e.g. wavemaker.injection_rate")
	vals := fs.String("values", "", "comma-separated values, as written in a configuration file")
	jobs := fs.Int("jobs", runtime.NumCPU(), "runs at the same time")
	member := fs.Int("member", -1, "run only this member (0-based), e.g. a job-array index")
	out := fs.String("out", "", "directory for one sub-directory of JSON outputs per member")
	if err := fs.Parse(args); err != nil {
		return err
	}
	if *key == "" || *vals == "" {
		return errors.New("sweep needs -key and -values")
	}
	if *jobs < 1 {
		return fmt.Errorf("-jobs = %d, want at least 1", *jobs)
	}
	base := experiment.Default()
	if *cfgPath != "" {
		var err error
		if base, err = experiment.Load(*cfgPath); err != nil {
			return err
		}
	}
	members, err := sweepMembers(base, *key, strings.Split(*vals, ","))
	if err != nil {
		return err
	}
	if *member >= len(members) {
		return fmt.Errorf("-member = %d, but the sweep has %d members", *member, len(members))
	}
	// every member prepared (configuration, initial state, output
	// directory) before any runs
	runs := make([]*output.Run, len(members))
	for i := range members {
		if *member >= 0 && i != *member {
			continue
		}
		o := output.Options{}
		if *out != "" {
			o.Dir = filepath.Join(*out, fmt.Sprintf("member-%03d", i))
		}
		r, err := output.Prepare(members[i].cfg, o)
		if err != nil {
			return fmt.Errorf("member %d (%s = %s): %w", i, *key, members[i].value, err)
		}
		defer r.Close()
		runs[i] = r
	}
	ctx, sig, stopSignals := signalContext()
	defer stopSignals()
	results := make([]*experiment.Experiment, len(members))
	errs := make([]error, len(members))
	sem := make(chan struct{}, *jobs)
	var wg sync.WaitGroup
	for i, r := range runs {
		if r == nil {
			continue
		}
		wg.Add(1)
		go func() {
			defer wg.Done()
			sem <- struct{}{}
			defer func() { <-sem }()
			results[i], errs[i] = r.Experiment(), r.Execute(ctx)
		}()
	}
	wg.Wait()
	if s := sig(); s != nil {
		fmt.Fprintf(stdout, "sweep stopped by %s; members that had not finished wrote no outputs\n", s.name)
		return s
	}
	fmt.Fprintf(stdout, "%-24s %12s %12s %12s %12s %10s %10s\n", *key, "eddy/day", "vort/day", "interf/day", "corr", "index", "EKE1")
	var firstErr error
	for i, m := range members {
		if *member >= 0 && i != *member {
			continue
		}
		if errs[i] != nil {
			fmt.Fprintf(stdout, "%-24s failed: %v\n", m.value, errs[i])
			if firstErr == nil {
				firstErr = fmt.Errorf("member %d (%s = %s): %w", i, *key, m.value, errs[i])
			}
			continue
		}
		s := results[i].Summary()
		fmt.Fprintf(stdout, "%-24s %+12.4f %+12.4f %+12.4f %+12.3f %10.3f %10.3g\n", m.value,
			s.Eddy.Rate, s.EddyVorticity.Rate, s.EddyInterface.Rate, s.EddyVorticity.Correlation, s.Index.Mean, s.EKE[0])
	}
	return firstErr
}
