package profiles

import (
	"fmt"
	"os"
	"path/filepath"
	"testing"
)

// write1000 fills dir with 1000 valid profiles, as a ward's folder might.
// Plain writes, not Save: the benchmark measures reading, and a thousand
// synced saves would only slow its setup.
func write1000(b *testing.B, dir string) {
	p, _, err := Open("demo-a", "")
	if err != nil {
		b.Fatal(err)
	}
	for i := 0; i < 1000; i++ {
		p.ID, p.Label = fmt.Sprintf("unit-%04d", i), fmt.Sprintf("unit %04d", i)
		data, err := Marshal(p)
		if err != nil {
			b.Fatal(err)
		}
		if err := os.WriteFile(filepath.Join(dir, p.ID+".json"), data, 0o644); err != nil {
			b.Fatal(err)
		}
	}
}

func BenchmarkOpenBuiltinWith1000Files(b *testing.B) {
	dir := b.TempDir()
	write1000(b, dir)
	b.ReportAllocs()
	b.ResetTimer()
	for i := 0; i < b.N; i++ {
		if _, _, err := Open("demo-a", dir); err != nil {
			b.Fatal(err)
		}
	}
}

func BenchmarkOpenBuiltinEmptyDir(b *testing.B) {
	dir := b.TempDir()
	b.ReportAllocs()
	b.ResetTimer()
	for i := 0; i < b.N; i++ {
		if _, _, err := Open("demo-a", dir); err != nil {
			b.Fatal(err)
		}
	}
}

func BenchmarkOpenByFileNameWith1000Files(b *testing.B) {
	dir := b.TempDir()
	write1000(b, dir)
	b.ReportAllocs()
	b.ResetTimer()
	for i := 0; i < b.N; i++ {
		if _, _, err := Open("unit-0500", dir); err != nil {
			b.Fatal(err)
		}
	}
}

func BenchmarkList1000Files(b *testing.B) {
	dir := b.TempDir()
	write1000(b, dir)
	b.ReportAllocs()
	b.ResetTimer()
	for i := 0; i < b.N; i++ {
		if _, err := List(dir); err != nil {
			b.Fatal(err)
		}
	}
}
