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
// meant as one or as a bank's other feature, and so is warned of. Its
// words (bankWord's, split at every character not a letter, so "LB2" is
// lb) must hold one naming a bank (see bankToken: bank, bankfull,
// overbank, lb, rb, tob, ...). A bank word inside another word
// (embankment) is not one. A mark naming a bank only as the place of a
// survey point (see placeWords: RB pin, stake on the left bank, BM LB)
// is not warned, unless it says top as well (TOB pin, top of bank pin),
// as a crew writes for the top of bank.
func bankLike(mark string) bool {
	w := bankWord(mark)
	if _, ok := readBankMark(mark); ok || w == "" {
		return false
	}
	words := strings.FieldsFunc(w, func(r rune) bool { return !('a' <= r && r <= 'z') })
	bank, top, place := false, false, false
	for i, f := range words {
		bank = bank || bankToken(f)
		top = top || slices.Contains([]string{"top", "tob", "ltob", "rtob", "lbt", "rbt"}, f) || (bankToken(f) && strings.Contains(f, "top"))
		place = place || slices.Contains(placeWords(), f) || (f == "bench" && i+1 < len(words) && words[i+1] == "mark")
	}
	return bank && (top || !place)
}

// bankToken reports a word (lower case, letters alone) that names a bank:
// the abbreviations crews write (lb, rb, tob, ltob, rtob, lbt, rbt, and
// bnk for bank), or a word beginning or ending with bank (bank, banks,
// bankfull, banktop, overbank, leftbank, riverbank), but not a word that
// holds bank only inside it (embankment).
func bankToken(f string) bool {
	if slices.Contains([]string{"lb", "rb", "tob", "ltob", "rtob", "lbt", "rbt", "lbank", "rbank", "bnk", "lbnk", "rbnk"}, f) {
		return true
	}
	return strings.HasPrefix(f, "bank") || strings.HasSuffix(f, "bank") || strings.HasSuffix(f, "banks")
}

// placeWords are the words of a mark that make it the description of a
// survey point at a bank rather than a bank mark (common practice of
// field books): a pin, a stake, a peg, a benchmark (bm, benchmark, bench
// mark), a rebar, a nail, a spike, a hub, a monument, a reference or
// control point, an instrument setup, a tree or post a point is on.
func placeWords() []string {
	return []string{"pin", "pins", "stake", "stakes", "peg", "pegs", "bm", "benchmark", "rebar", "nail", "spike", "hub",
		"monument", "rp", "cp", "control", "reference", "setup", "instrument", "tree", "post", "bolt", "marker"}
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
