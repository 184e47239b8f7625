//go:build unix

package sweep

import (
	"errors"
	"fmt"
	"os"
	"path/filepath"
	"syscall"
)

// lockMember takes the lock of member name in the sweep directory dir
// without waiting: ok is false when another process holds it. The lock is
// an advisory flock(2) lock on a file in dir/.locks, released by unlock or
// when the process ends, however it ends.
func lockMember(dir, name string) (unlock func(), ok bool, err error) {
	ld := filepath.Join(dir, locksDir)
	if err := os.MkdirAll(ld, 0o755); err != nil {
		return nil, false, fmt.Errorf("lock: %w", err)
	}
	f, err := os.OpenFile(filepath.Join(ld, name+".lock"), os.O_CREATE|os.O_RDWR, 0o644)
	if err != nil {
		return nil, false, fmt.Errorf("lock: %w", err)
	}
	if err := syscall.Flock(int(f.Fd()), syscall.LOCK_EX|syscall.LOCK_NB); err != nil {
		f.Close()
		if errors.Is(err, syscall.EWOULDBLOCK) {
			return nil, false, nil
		}
		return nil, false, fmt.Errorf("lock %s: %w", f.Name(), err)
	}
	return func() { f.Close() }, true, nil
}
