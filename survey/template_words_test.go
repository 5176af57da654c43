package survey

import (
	"regexp"
	"slices"
	"strings"
	"testing"

	"wetline/rating"
)

// Every word a reader takes in a column of the field workbook is listed,
// quoted, under that sheet's topic of the instructions, and every word
// quoted there is one a reader of that sheet takes: the cross-section
// sheets' bank words, the coordinate sheet's pin words (and bank words),
// the reach sheet's quality and structure words, the gaugings sheet's
// quality words and the exclude column's words that keep a gauging. A
// word is quoted as quoted writes it; an apostrophe inside a word
// (measurement's) quotes nothing.
func TestInstructionsListEveryWordRead(t *testing.T) {
	t.Parallel()
	names := []string{SectionSheetName(1), SectionSheetName(2)}
	lines := instructionLines(TemplateOptions{Units: rating.SI}, names)
	topics := map[string]string{}
	for _, l := range lines {
		topics[l[0]] = l[1]
	}
	bank := func(w string) bool { _, ok := readBankMark(w); return ok }
	pin := func(w string) bool { _, ok := readPinMark(w); return ok }
	quality := func(w string) bool { q, err := rating.ParseQuality(w); return err == nil && q != rating.Unrated }
	structure := func(w string) bool { _, err := parseStructure(w); return err == nil }
	keep := func(w string) bool { return excludeReason(w) == "" }
	for _, tc := range []struct {
		topic string
		read  []func(string) bool // a quoted word must be read by one of them
		words [][]string          // the words the readers take, each to be quoted
	}{
		{strings.Join(names, ", "), []func(string) bool{bank}, [][]string{BankWords()}},
		{FieldSheetCoordinates, []func(string) bool{pin, bank}, [][]string{PinWords(), {MarkBank}}},
		{FieldSheetReach, []func(string) bool{quality, structure}, [][]string{rating.AcceptedQualityWords(), StructureWords(), OpenChannelWords()}},
		{FieldSheetGaugings, []func(string) bool{quality, keep}, [][]string{rating.AcceptedQualityWords(), KeepWords()}},
	} {
		text, ok := topics[tc.topic]
		if !ok {
			t.Fatalf("no topic %q", tc.topic)
		}
		quotedWords := regexp.MustCompile(`(?:^|[^\pL])'([^']+)'(?:[^\pL]|$)`).FindAllStringSubmatch(text, -1)
		var listed []string
		for _, m := range quotedWords {
			listed = append(listed, m[1])
			if !slices.ContainsFunc(tc.read, func(read func(string) bool) bool { return read(m[1]) }) {
				t.Errorf("%s: the instructions list %q, which no reader of the sheet takes", tc.topic, m[1])
			}
		}
		for _, ws := range tc.words {
			for _, w := range ws {
				if !slices.Contains(listed, w) {
					t.Errorf("%s: the readers take %q, which the instructions do not list: %s", tc.topic, w, text)
				}
			}
		}
	}
	// The quality error names every word ParseQuality takes.
	for _, w := range rating.AcceptedQualityWords() {
		if !strings.Contains(rating.ErrQuality.Error(), w) || !strings.Contains(ErrMarkQuality.Error(), w) {
			t.Errorf("quality errors %q, %q do not name %q", rating.ErrQuality, ErrMarkQuality, w)
		}
	}
}

// The gaugings topic says how a time is read as the reader reads it: a
// time without an offset at --utc-offset, else UTC, and a tz column
// (ColTimeZone, one of TimeZoneColumns) giving each row its zone, with
// every zone abbreviation the reader takes.
func TestInstructionsSayHowGaugingTimesAreRead(t *testing.T) {
	t.Parallel()
	var text string
	for _, l := range instructionLines(TemplateOptions{Units: rating.SI}, []string{SectionSheetName(1)}) {
		if l[0] == FieldSheetGaugings {
			text = l[1]
		}
	}
	if !slices.Contains(TimeZoneColumns(), ColTimeZone) {
		t.Fatalf("%q is not a time-zone column", ColTimeZone)
	}
	for _, want := range append([]string{"--utc-offset", "else as UTC", "column headed " + ColTimeZone, "fill it on every row"}, ZoneAbbreviations()...) {
		if !strings.Contains(text, want) {
			t.Errorf("gaugings topic lacks %q: %s", want, text)
		}
	}
	if strings.Contains(text, "state the zone in a note") {
		t.Errorf("gaugings topic asks for the zone in a note, which is not read: %s", text)
	}
}
