package survey

import (
	"errors"
	"fmt"
	"slices"
	"strings"
)

// bankSide is the side of the channel a bank mark names: either, left or
// right (looking downstream).
type bankSide uint8

const (
	eitherBank bankSide = iota
	leftBank
	rightBank
)

// bankMark is a word of the mark column read as a bank mark, and the side
// it names.
type bankMark struct {
	word string
	side bankSide
}

// bankMarks is the one list of the words read as a bank mark: MarkBank and
// the words field crews write for the top of a bank (common practice), some
// naming the side. They are matched as bankWord normalises a mark.
func bankMarks() []bankMark {
	return []bankMark{
		{MarkBank, eitherBank}, {"top of bank", eitherBank}, {"bank top", eitherBank}, {"tob", eitherBank},
		{"left bank", leftBank}, {"left top of bank", leftBank}, {"left bank top", leftBank}, {"lb", leftBank}, {"ltob", leftBank}, {"left tob", leftBank},
		{"right bank", rightBank}, {"right top of bank", rightBank}, {"right bank top", rightBank}, {"rb", rightBank}, {"rtob", rightBank}, {"right tob", rightBank},
	}
}

// BankWords returns the words of the mark column read as a bank mark, as
// MarkBank is (a fresh slice, MarkBank first). They are matched in any
// case, with runs of spaces, hyphens and underscores alike and dots
// dropped ("Top-of-Bank", "L.B." and "lb" are bank marks). A word naming a
// side (left bank, lb, ...) must be on that side of the other bank mark
// (ErrBankSide).
func BankWords() []string {
	var out []string
	for _, b := range bankMarks() {
		out = append(out, b.word)
	}
	return out
}

// bankWord normalises a mark for matching against BankWords: lower case,
// dots dropped, runs of spaces, hyphens and underscores one space.
func bankWord(mark string) string {
	m := strings.ToLower(strings.ReplaceAll(mark, ".", ""))
	return strings.Join(strings.FieldsFunc(m, func(r rune) bool { return r == ' ' || r == '\t' || r == '-' || r == '_' }), " ")
}

// readBankMark reports whether a mark is a bank mark (one of BankWords)
// and the side it names. The mark matches with its spaces or without
// them, so that "L. B." is lb as "L.B." is.
func readBankMark(mark string) (bankSide, bool) {
	w := bankWord(mark)
	compact := strings.ReplaceAll(w, " ", "")
	for _, b := range bankMarks() {
		if b.word == w || strings.ReplaceAll(b.word, " ", "") == compact {
			return b.side, true
		}
	}
	return eitherBank, false
}

// bankLike reports a mark that is not a bank mark but looks as if it were
// meant as one or as a bank's other feature: it holds the word bank
// (bankfull, overbank, left bank pin), or a word like lb, rb or tob.
func bankLike(mark string) bool {
	w := bankWord(mark)
	if _, ok := readBankMark(mark); ok || w == "" {
		return false
	}
	if strings.Contains(w, "bank") {
		return true
	}
	for _, f := range strings.FieldsFunc(w, func(r rune) bool { return !('a' <= r && r <= 'z') }) {
		if slices.Contains([]string{"lb", "rb", "tob", "ltob", "rtob", "lbank", "rbank"}, f) {
			return true
		}
	}
	return false
}

// ErrBankSide is the cause of a bank mark naming one side (left bank, rb)
// that lies on the other side of the section's other bank mark.
var ErrBankSide = errors.New("the bank mark names the other side")

// bankSideError returns the error of the two bank marks of a section (at
// rows a and b, a the one at the lower station, marks ma and mb, stations
// sa and sb) when one names the side it is not on, else nil.
func bankSideError(t *Table, a, b Record, col int, ma, mb string, sa, sb float64) error {
	sideA, _ := readBankMark(ma)
	sideB, _ := readBankMark(mb)
	switch {
	case sideA == rightBank:
		return t.At(a, col, fmt.Errorf("%w: a right bank mark at station %s lies left of the other bank mark (%q at row %d, station %s); left is looking downstream",
			ErrBankSide, roundLength(sa), echo(mb), b.Row, roundLength(sb)))
	case sideB == leftBank:
		return t.At(b, col, fmt.Errorf("%w: a left bank mark at station %s lies right of the other bank mark (%q at row %d, station %s); left is looking downstream",
			ErrBankSide, roundLength(sb), echo(ma), a.Row, roundLength(sa)))
	}
	return nil
}
