package rating

import (
	"strconv"
	"strings"
)

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

// JoinAnd joins words as a list in prose: "a", "a and b", "a, b and c"
// ("" for none).
func JoinAnd(w []string) string {
	if len(w) < 2 {
		return strings.Join(w, "")
	}
	return strings.Join(w[:len(w)-1], ", ") + " and " + w[len(w)-1]
}
