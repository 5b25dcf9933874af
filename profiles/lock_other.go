//go:build !unix

package profiles

// lockBeside does nothing where there is no flock: saves still go through
// a temporary file and a rename, and the changed-since-read check still
// runs, but two savers at the same instant are not kept apart.
func lockBeside(string) (unlock func(), err error) { return func() {}, nil }

// openReadFlags: no FIFOs to guard against here.
const openReadFlags = 0
