package profiles

// The program saves only through SaveWithBackupIfUnchanged; these two
// forms of the same guarded save let the tests reach its other branches
// (no backup; no stamp to compare).

func SaveIfUnchanged(path string, p Profile, read Stamp) error {
	return guardedSave(path, p, false, &read)
}

func SaveWithBackup(path string, p Profile) error {
	return guardedSave(path, p, true, nil)
}

// Save validates p and writes it to path atomically: a temporary file in the
// same directory, synced, then renamed over the old file, then the
// directory synced. On any error the old file is left as it was. It refuses
// a symbolic link (naming the real file) and anything not a regular file,
// keeps an existing file's mode (a new file is 0644), holds an exclusive
// lock on path + ".lock" while it writes, and removes temporary files of
// its own naming left by a save killed more than 10 minutes ago. Save does
// not check whether the file changed since it was read: SaveIfUnchanged does.
func Save(path string, p Profile) error {
	return guardedSave(path, p, false, nil)
}
