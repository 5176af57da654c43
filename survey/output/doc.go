// Package output writes wetline's output files safely: each file goes to
// a temporary file beside it, and a run's files are put in place together
// only when all are complete, all or none, so a failed or interrupted run
// leaves no partial file and every existing file as it was. No output ever
// replaces an input (nor the file standard input is read from), a
// symbolic link, or anything that is not a regular file, and an output
// folder replaces an existing one only when that holds nothing but an
// earlier output. It also makes and clears the run's scratch folder.
package output
