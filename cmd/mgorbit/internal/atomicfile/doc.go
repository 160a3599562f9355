// Package atomicfile writes output files so that readers only ever see
// either the old file or the complete new one: the content goes to a
// temporary file in the same directory, is synced to disk, and is then
// renamed into place. A failed write leaves nothing behind.
package atomicfile
