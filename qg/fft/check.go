package fft

import "fmt"

// checkArgs validates the arguments of NewPlan2D.
func checkArgs(nx, ny, workers int) error {
	if err := checkSize("nx", nx); err != nil {
		return err
	}
	if err := checkSize("ny", ny); err != nil {
		return err
	}
	if workers < 1 || workers > MaxWorkers {
		return fmt.Errorf("fft: workers = %d, want 1 <= workers <= %d", workers, MaxWorkers)
	}
	if nx*ny > MaxPoints {
		return fmt.Errorf("fft: nx·ny = %d×%d = %d points, more than the %d a plan supports", nx, ny, nx*ny, MaxPoints)
	}
	return nil
}

// Limits of a plan. MaxSize bounds each dimension and MaxPoints the field (2²⁶ points: 512 MiB per real
// field, 1 GiB for the plan's buffers); MaxWorkers bounds the goroutines of one plan.
const (
	MaxSize    = 1 << 16
	MaxPoints  = 1 << 26
	MaxWorkers = 256
)

func checkSize(name string, n int) error {
	if n < 4 || n > MaxSize || n&(n-1) != 0 {
		return fmt.Errorf("fft: %s = %d is not a power of two between 4 and %d", name, n, MaxSize)
	}
	return nil
}

// checkColumns validates the argument of SetColumns for a plan with nx grid points along x.
func checkColumns(ncols, nx int) error {
	if ncols < 1 || ncols > nx/2+1 {
		return fmt.Errorf("fft: SetColumns: ncols = %d, want 1 <= ncols <= nx/2+1 = %d", ncols, nx/2+1)
	}
	return nil
}
