//go:build !unix

package sweep

// lockMember takes no lock where flock(2) is missing: two processes must
// not run the same sweep directory at once there.
func lockMember(dir, name string) (unlock func(), ok bool, err error) {
	return func() {}, true, nil
}
