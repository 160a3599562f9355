// Package table stores result tables as zstd-compressed Parquet files.
//
// A table is a slice of a struct type; each field becomes a column named by
// its `parquet:"..."` tag. Column names are snake_case and carry the unit,
// e.g. `parquet:"precession_arcsec_per_century"`.
//
// Quantities that can be undefined (an orbit that never reached perihelion,
// say) are pointer fields tagged `,optional` and stored as NULL, so that
// dataframe tools show them as missing rather than as a NaN that silently
// poisons sums and means. Nullable and OrNaN convert between the two
// conventions. Float64 values, including NaN in a non-optional column, are
// stored with their exact bits.
//
// File-level key-value metadata records how the table was made. Output is
// deterministic: the same rows and metadata always give the same bytes.
package table
