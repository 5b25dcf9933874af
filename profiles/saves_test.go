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
