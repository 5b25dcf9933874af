// Package tests holds the cross-package checks of crankside against
// published sources. Each check names its source beside it, as written in
// the project's list of references: a paper or specification, "derived"
// (recomputed from a published formula in the comment), "common practice",
// or "from memory". It also builds the command and runs it where only a
// process shows what is checked (exit statuses of huge or hostile input,
// time zones, the terminal); the other end-to-end runs are in-process, in
// the module root's tests.
package tests
