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
	if workers < 1 {
		return fmt.Errorf("fft: workers = %d, want >= 1", workers)
	}
	return nil
}

func checkSize(name string, n int) error {
	if n < 4 || n&(n-1) != 0 {
		return fmt.Errorf("fft: %s = %d is not a power of two >= 4", name, n)
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
