package survey

import (
	"strings"
	"testing"
)

// FuzzFormatSection feeds number format codes to the parser that tells a
// percent or a date format (formatSection, percentFormat, dateFormat): no
// panic; the codes kept are no longer than the format, hold no quote,
// separator, space, bracket, escape or spacing character, and so read
// back unchanged, with the same verdicts.
func FuzzFormatSection(f *testing.F) {
	for _, s := range []string{
		"General", "0.00%", "0%;-0%", `0.0"%"`, `0\%`, "yyyy-mm-dd", "[h]:mm:ss", "[$-409]d-mmm-yy;@",
		"[Red]0.00;[Blue]-0.00", `#,##0_);(#,##0)`, "*-0", `"date: "0`, "0.0E+00", "[", `"`, `\`, "_", "0;", "[mm]", "[hms]",
	} {
		f.Add(s)
	}
	f.Fuzz(func(t *testing.T, code string) {
		sec := formatSection(code)
		if len(sec) > len(code) {
			t.Fatalf("%q: codes %q longer than the format", code, sec)
		}
		if strings.ContainsAny(sec, "\";[ \\_*") {
			t.Fatalf("%q: codes %q hold a quote, separator, space, bracket, escape or spacing character", code, sec)
		}
		if again := formatSection(sec); again != sec {
			t.Fatalf("%q: codes %q read back as %q", code, sec, again)
		}
		if percentFormat(code) != strings.HasSuffix(sec, "%") || dateFormat(code) != dateFormat(sec) {
			t.Fatalf("%q: verdicts differ from its codes' %q", code, sec)
		}
	})
}
