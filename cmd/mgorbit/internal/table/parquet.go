package table

import (
	"fmt"
	"io"
	"maps"
	"math"
	"os"
	"slices"

	"github.com/parquet-go/parquet-go"

	"mgorbit/cmd/mgorbit/internal/atomicfile"
)

// Write stores rows and meta at path as one Parquet file, atomically: the
// file appears complete or not at all. An existing path is replaced only
// if force is set.
func Write[T any](path string, rows []T, meta map[string]string, force bool) error {
	return atomicfile.Write(path, force, func(w io.Writer) error {
		return encode(w, rows, meta)
	})
}

func encode[T any](w io.Writer, rows []T, meta map[string]string) error {
	options := []parquet.WriterOption{parquet.Compression(&parquet.Zstd)}
	// Sorted so the footer never depends on map iteration order.
	for _, key := range slices.Sorted(maps.Keys(meta)) {
		options = append(options, parquet.KeyValueMetadata(key, meta[key]))
	}
	writer := parquet.NewGenericWriter[T](w, options...)
	if _, err := writer.Write(rows); err != nil {
		return fmt.Errorf("writing rows: %w", err)
	}
	return writer.Close()
}

// Read loads a file written by Write. The file's columns must match those
// of T (names, types and optionality; order may differ), so that a table
// of another shape is an error instead of silently zero-filled fields.
func Read[T any](path string) ([]T, map[string]string, error) {
	f, err := os.Open(path)
	if err != nil {
		return nil, nil, err
	}
	defer f.Close()
	info, err := f.Stat()
	if err != nil {
		return nil, nil, err
	}
	file, err := parquet.OpenFile(f, info.Size())
	if err != nil {
		return nil, nil, fmt.Errorf("%s: %w", path, err)
	}
	want := parquet.SchemaOf(new(T))
	if !parquet.SameNodes(want, file.Schema()) {
		return nil, nil, fmt.Errorf("%s: columns do not match: file has %v, expected %v",
			path, file.Schema(), want)
	}

	meta := make(map[string]string)
	for _, kv := range file.Metadata().KeyValueMetadata {
		meta[kv.Key] = kv.Value
	}

	reader := parquet.NewGenericReader[T](file)
	defer reader.Close()
	rows := make([]T, file.NumRows())
	done := 0
	for done < len(rows) {
		n, err := reader.Read(rows[done:])
		done += n
		if err == io.EOF || (err == nil && n == 0) {
			break
		}
		if err != nil {
			return nil, nil, fmt.Errorf("%s: reading rows: %w", path, err)
		}
	}
	if done != len(rows) {
		return nil, nil, fmt.Errorf("%s: footer promises %d rows, read %d", path, len(rows), done)
	}
	return rows, meta, nil
}

// Nullable maps NaN, the in-memory mark of an undefined value, to nil,
// which an optional column stores as NULL.
func Nullable(x float64) *float64 {
	if math.IsNaN(x) {
		return nil
	}
	return &x
}

// OrNaN is the inverse of Nullable.
func OrNaN(p *float64) float64 {
	if p == nil {
		return math.NaN()
	}
	return *p
}
