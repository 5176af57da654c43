package survey

import (
	"errors"
	"os"
	"slices"
	"strings"
	"testing"
)

// bankSurvey is a survey of five points whose second and fourth points
// carry the marks left and right, and whose middle point carries mid.
func bankSurvey(left, mid, right string) string {
	return "station,elevation,n,mark\n0,5,0.04,\n10,3,0.04," + left + "\n20,0,0.03," + mid + "\n30,3,0.05," + right + "\n40,5,,\n"
}

// The words crews write for a bank are read as a bank mark, in any case
// and spelling of spaces, hyphens and dots; a word naming a side must be
// on that side; a mark that looks like a bank's but is not read as one is
// warned of at its cell.
func TestBankWords(t *testing.T) {
	for _, tc := range []struct {
		name, left, mid, right string
		banks                  bool   // read with banks at 10 and 30
		err                    error  // the cause of the error, nil for none
		at                     string // the error's or the warning's position and words
	}{
		{"bank", "bank", "", "BANK", true, nil, ""},
		{"left and right bank", "left bank", "", "Right Bank", true, nil, ""},
		{"lb rb", "LB", "", "RB", true, nil, ""},
		{"dotted", "L.B.", "", "r.b.", true, nil, ""},
		{"dotted with spaces", "L. B.", "", "R. B.", true, nil, ""},
		{"trailing dot", "LB.", "", "R. B.", true, nil, ""},
		{"left tob", "left TOB", "", "Right Tob", true, nil, ""},
		{"top of bank", "Top-of-Bank", "", "TOB", true, nil, ""},
		{"left top of bank", "left top of bank", "", "right_top_of_bank", true, nil, ""},
		{"bank top and rtob", "bank top", "", "RTOB", true, nil, ""},
		{"side-free beside a side", "bank", "", "rb", true, nil, ""},
		{"right bank on the left", "right bank", "", "left bank", false, ErrBankSide, `xs.csv:3:4: mark "right bank": the bank mark names the other side`},
		{"rb on the left", "rb", "", "bank", false, ErrBankSide, `xs.csv:3:4: mark "rb"`},
		{"lb on the right", "bank", "", "lb", false, ErrBankSide, `xs.csv:5:4: mark "lb"`},
		{"two lefts", "lb", "", "lb", false, ErrBankSide, `xs.csv:5:4: mark "lb"`},
		{"three banks", "lb", "bank", "rb", false, ErrBankMarks, `xs.csv:5:4`},
		{"bankfull warned", "bank", "bankfull", "bank", true, nil, `xs.csv:4:4: mark "bankfull": not read as a bank mark`},
		{"lb toe warned", "", "LB toe", "", false, nil, `xs.csv:4:4: mark "LB toe": not read as a bank mark (the bank marks are bank, top of bank`},
		{"overbank warned", "left bank", "overbank", "right bank", true, nil, `xs.csv:4:4: mark "overbank"`},
		{"thalweg not warned", "bank", "thalweg", "bank", true, nil, ""},
		{"label beside lb not warned", "lb", "lbs", "rb", true, nil, ""},
	} {
		t.Run(tc.name, func(t *testing.T) {
			sv, err := ParseSection(strings.NewReader(bankSurvey(tc.left, tc.mid, tc.right)), "xs.csv", SectionOptions{})
			if tc.err != nil {
				if !errors.Is(err, tc.err) || !strings.Contains(err.Error(), tc.at) {
					t.Fatalf("error %v, want %v at %q", err, tc.err, tc.at)
				}
				return
			}
			if err != nil {
				t.Fatal(err)
			}
			s := sv.Section
			if got := s.HasBanks && s.LeftBank == 10 && s.RightBank == 30; got != tc.banks {
				t.Errorf("banks %v at %g, %g; want banks %v", s.HasBanks, s.LeftBank, s.RightBank, tc.banks)
			}
			all := strings.Join(sv.Warnings, "\n")
			if (tc.at == "") != (all == "") || !strings.Contains(all, tc.at) {
				t.Errorf("warnings %q, want %q", all, tc.at)
			}
			if tc.banks && (sv.Labels[1] != "" || sv.Labels[3] != "") {
				t.Errorf("bank marks kept as labels %q", sv.Labels)
			}
		})
	}
}

// Banks given elsewhere: a mark like a bank's is not warned of.
func TestBankLikeIgnored(t *testing.T) {
	sv, err := ParseSection(strings.NewReader(bankSurvey("", "bankfull", "")), "xs.csv", SectionOptions{IgnoreBankMarks: true})
	if err != nil || len(sv.Warnings) != 0 {
		t.Errorf("%v, warnings %q", err, sv.Warnings)
	}
}

// BankWords is a fresh slice each call, MarkBank first, each word read as
// a bank mark.
func TestBankWordsList(t *testing.T) {
	w := BankWords()
	if w[0] != MarkBank || !slices.Contains(w, "left bank") || !slices.Contains(w, "rb") {
		t.Errorf("BankWords %q", w)
	}
	w[0] = "changed"
	if BankWords()[0] != MarkBank {
		t.Error("BankWords shares its slice")
	}
	for _, word := range BankWords() {
		if _, ok := readBankMark(strings.ToUpper(word)); !ok {
			t.Errorf("%q is not read as a bank mark", word)
		}
	}
}

// A coordinate survey taken right to left reads its side words after
// the points are put in station order: "left bank" surveyed last is on
// the left.
func TestBankWordsCoordinates(t *testing.T) {
	in := "easting,northing,elevation,n,mark\n40,0,5,0.04,right pin\n30,0,3,0.04,right bank\n20,0,0,0.03,\n10,0,3,0.05,left bank\n0,0,5,,left pin\n"
	sv, err := ParseSection(strings.NewReader(in), "xs.csv", SectionOptions{})
	if err != nil {
		t.Fatal(err)
	}
	if s := sv.Section; !s.HasBanks || s.LeftBank != 10 || s.RightBank != 30 {
		t.Errorf("banks %v at %g, %g; want 10, 30", s.HasBanks, s.LeftBank, s.RightBank)
	}
}

// README's survey row names every bank word.
func TestReadmeBankWords(t *testing.T) {
	b, err := os.ReadFile("../README.md")
	if err != nil {
		t.Skip(err)
	}
	var row string
	for _, line := range strings.Split(string(b), "\n") {
		if strings.HasPrefix(line, "| survey |") {
			row = line
		}
	}
	for _, w := range BankWords() {
		if !strings.Contains(row, "`"+w+"`") {
			t.Errorf("README's survey row does not name %q: %q", w, row)
		}
	}
}

// A mark that a crew may have meant for the top of a bank, or that names
// another feature of a bank, is warned of; a word holding bank inside it
// and a survey point described by the bank it stands on are not.
func TestBankLike(t *testing.T) {
	warned := []string{
		"bankfull", "overbank", "LB toe", "toe of bank", "top bank", "top of the bank", "bank top left", "TOB L",
		"TOB-L", "LBT", "rt bank", "L bank", "bank (left)", "bank left", "left bank 2", "bank-top-left",
		"top-of-bank?", "riverbank", "banks", "top of bnk", "RB1", "TOB pin", "top of bank pin", "left bank top stake",
		"lbank", "R.Bank",
	}
	quiet := []string{
		"", "thalweg", "water edge", "left pin", "lbs", "embankment", "road embankment", "Embankment toe",
		"RB pin", "pin RB", "left bank pin", "LB stake", "stake on the right bank", "BM on RB", "benchmark LB",
		"bench mark, left bank", "peg lb", "rebar RB", "nail in RB tree", "RB hub", "RB control point", "RB setup",
		"bank", "LB", "r. b.", "left top of bank", "L TOB", "banktop", // bank marks: read, not warned
	}
	for _, m := range warned {
		if !bankLike(m) {
			t.Errorf("%q not warned of", m)
		}
	}
	for _, m := range quiet {
		if bankLike(m) {
			t.Errorf("%q warned of", m)
		}
	}
}

// One bank mark alone: the error names the bank missing, the side the
// present mark does not name, or the other bank when it names none. The
// data are invented.
func TestOneBankSaysWhichIsMissing(t *testing.T) {
	t.Parallel()
	for _, tc := range []struct{ mark, want string }{
		{"LTOB", `xs.csv:3:3: mark "LTOB": exactly two points must be marked bank, found 1: the left bank is marked (station 5), the right bank is missing`},
		{"R.B.", `xs.csv:3:3: mark "R.B.": exactly two points must be marked bank, found 1: the right bank is marked (station 5), the left bank is missing`},
		{"bank", `xs.csv:3:3: mark "bank": exactly two points must be marked bank, found 1: the other bank is missing (one bank is marked, station 5)`},
	} {
		_, err := ParseSection(strings.NewReader("station,elevation,mark\n0,3,\n5,2,"+tc.mark+"\n10,0,\n20,3,\n"), "xs.csv", SectionOptions{})
		if !errors.Is(err, ErrBankMarks) || !strings.Contains(err.Error(), tc.want) {
			t.Errorf("%s: %v, want %q", tc.mark, err, tc.want)
		}
	}
}
