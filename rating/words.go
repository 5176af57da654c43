package rating

import "strconv"

// Counted writes a count with its noun agreeing: "1 subsection",
// "3 subsections", "0 subsections". It is the one place every report and
// figure of the project builds such a phrase.
func Counted(n int, one, many string) string {
	return strconv.Itoa(n) + " " + Agree(n, one, many)
}

// Agree returns one when n is 1 and many otherwise: the word of a message
// that agrees with a count ("1 reading lies", "2 readings lie").
func Agree(n int, one, many string) string {
	if n == 1 {
		return one
	}
	return many
}
