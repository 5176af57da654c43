package rating

import "strconv"

// Counted writes a count with its noun agreeing: "1 subsection",
// "3 subsections", "0 subsections". It is the one place every report and
// figure of the project builds such a phrase.
func Counted(n int, one, many string) string {
	if n == 1 {
		return strconv.Itoa(n) + " " + one
	}
	return strconv.Itoa(n) + " " + many
}
