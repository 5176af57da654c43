// Package output writes wetline's output files safely: each file goes to
// a temporary file beside it and is renamed into place only when it is
// complete, so a failed or interrupted run leaves no partial file and
// every existing file as it was, and no output ever replaces an input.
package output
