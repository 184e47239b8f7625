// Package output runs an experiment with its files: the JSON summary and
// series, the resolved configuration as TOML, the NetCDF fields (time means,
// snapshots, series) and the figures, written into a staging directory and
// moved over the output directory as a whole when the run ends, a
// checkpoint kept up to date, and restarts that continue the files where an
// interrupted run left them.
//
// [Prepare] checks everything a run will need before its first step (the
// configuration, the initial state, a restart file, the output directory,
// the checkpoint path) and returns a [Run]; [Run.Execute] integrates it. The
// command-line program, the sweeps and a user's own Go driver all run
// experiments this way.
//
// Subpackages: netcdf (the NetCDF classic and 64-bit-offset formats),
// figure (the figures) and palette (colour scales, contours, drawing).
package output
