// Package tests holds the cross-package checks of crankside against
// published sources. Each check names its source beside it, as written in
// the project's list of references: a paper or specification, "derived"
// (recomputed from a published formula in the comment), "common practice",
// or "from memory". It also builds the command and runs it end to end.
package tests
