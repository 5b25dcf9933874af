package safetext_test

import (
	"fmt"
	"os"

	"crankside/profiles/safetext"
)

func ExampleEscape() {
	// A bed label carrying a clear-screen sequence and a right-to-left
	// override prints as text, on one line.
	fmt.Println(safetext.Escape("B4\x1b[2J\u202e\n"))
	// Output: B4\x1b[2J\u202e\n
}

func ExampleFirstUnsafe() {
	r, at, found := safetext.FirstUnsafe("8\u200b")
	fmt.Println(found, at, safetext.Kind(r), fmt.Sprintf("U+%04X", r))
	// Output: true 1 an invisible character U+200B
}

func ExampleWriter() {
	w := safetext.NewWriter(os.Stdout)
	fmt.Fprint(w, "bed\tB4\n\x1b]52;c;aGk=\x07\n")
	w.Flush()
	// Output:
	// bed	B4
	// \x1b]52;c;aGk=\x07
}
