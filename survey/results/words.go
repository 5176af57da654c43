package results

import "wetline/rating"

// counted writes a count with its noun, one for 1 and many otherwise:
// "1 discharge", "30 discharges".
func counted(n int, one, many string) string {
	return rating.Counted(n, one, many)
}

// agree returns one when n is 1, many otherwise: the word of a message
// that agrees with a count ("1 of 5 checks warns", "2 of 5 checks warn").
func agree(n int, one, many string) string {
	if n == 1 {
		return one
	}
	return many
}
