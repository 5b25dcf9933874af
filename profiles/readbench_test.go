package profiles

import "io"

// ReadBench is ReadBenchNumbers with a decimal point only, for the tests
// of the reader itself; the program reads bench files through
// setup.ReadBench, which hands it the one number parser.
func ReadBench(r io.Reader, source string, p Profile) ([]BenchPoint, error) {
	return ReadBenchNumbers(r, source, p, nil)
}
