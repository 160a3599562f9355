// Reads Parquet files with DuckDB, a reader that shares no code with the
// project, and prints what it sees as JSON so Go tests can compare it with
// what they wrote.
//
// Usage: node check.mjs FILE_OR_GLOB
//
// Output (one JSON object):
//   row_count  number of rows over all matched files
//   columns    [{name, type}] as DuckDB types them (DOUBLE, BIGINT, ...)
//   rows       [[...]] in file order; DOUBLE values are JSON numbers, except
//              -0, NaN and the infinities, which are strings ("-0", "NaN",
//              "Infinity", "-Infinity") because JSON numbers cannot carry them;
//              BIGINT values are decimal strings so no digit is lost
//   files      [{file, created_by, kv: {key: value}, columns: [{name,
//              physical_type, repetition, compression}]}], one per file

import { DuckDBInstance } from '@duckdb/node-api';

const target = process.argv[2];
if (!target || process.argv.length > 3) {
  process.stderr.write('usage: node check.mjs FILE_OR_GLOB\n');
  process.exit(2);
}

// SQL string literal; DuckDB doubles embedded quotes.
const lit = (s) => "'" + s.replaceAll("'", "''") + "'";
const src = lit(target);

// JSON.stringify turns -0 into 0 and NaN/Infinity into null; keep them apart.
function jsonValue(v) {
  if (v === null || v === undefined) return null;
  if (typeof v === 'bigint') return v.toString();
  if (typeof v === 'number') {
    if (Object.is(v, -0)) return '-0';
    if (!Number.isFinite(v)) return String(v);
    return v; // shortest round-trip decimal: exact for float64
  }
  if (typeof v === 'string' || typeof v === 'boolean') return v;
  return String(v);
}

const instance = await DuckDBInstance.create(':memory:');
const conn = await instance.connect();
try {
  const data = await conn.runAndReadAll(`SELECT * FROM read_parquet(${src})`);
  const names = data.columnNames();
  const types = data.columnTypes().map(String);
  const rows = data.getRows().map((row) => row.map(jsonValue));

  const files = new Map();
  const fileFor = (name) => {
    if (!files.has(name)) files.set(name, { file: name, created_by: null, kv: {}, columns: [] });
    return files.get(name);
  };

  const fileMeta = await conn.runAndReadAll(
    `SELECT file_name, created_by FROM parquet_file_metadata(${src}) ORDER BY file_name`);
  for (const [file, createdBy] of fileMeta.getRows()) fileFor(file).created_by = createdBy;

  const kv = await conn.runAndReadAll(
    `SELECT file_name, decode(key), decode(value) FROM parquet_kv_metadata(${src})`);
  for (const [file, key, value] of kv.getRows()) fileFor(file).kv[key] = value;

  // Leaf columns only (num_children is NULL); the root is the schema node.
  const schema = await conn.runAndReadAll(
    `SELECT file_name, name, type, repetition_type FROM parquet_schema(${src})
     WHERE num_children IS NULL OR num_children = 0 ORDER BY file_name, column_id`);
  const byFile = new Map();
  for (const [file, name, physical, repetition] of schema.getRows()) {
    const col = { name, physical_type: physical, repetition, compression: [] };
    fileFor(file).columns.push(col);
    if (!byFile.has(file)) byFile.set(file, new Map());
    byFile.get(file).set(name, col);
  }

  const chunks = await conn.runAndReadAll(
    `SELECT DISTINCT file_name, path_in_schema, compression FROM parquet_metadata(${src})
     ORDER BY file_name, path_in_schema, compression`);
  for (const [file, path, compression] of chunks.getRows()) {
    const col = byFile.get(file)?.get(path);
    if (col) col.compression.push(compression);
  }

  const out = {
    row_count: rows.length,
    columns: names.map((name, i) => ({ name, type: types[i] })),
    rows,
    files: [...files.values()].sort((a, b) => (a.file < b.file ? -1 : a.file > b.file ? 1 : 0)),
  };
  process.stdout.write(JSON.stringify(out) + '\n');
} finally {
  conn.closeSync();
  instance.closeSync();
}
