package results

import (
	"fmt"
	"strings"
	"text/tabwriter"
)

// textReport gathers a plain-text report: formatted lines and tables of
// columns aligned by spaces, every table line indented by two spaces.
type textReport struct {
	b strings.Builder
}

// line writes one line formatted as by fmt.Sprintf.
func (t *textReport) line(format string, a ...any) { fmt.Fprintf(&t.b, format+"\n", a...) }

// table writes a header and its rows, cells separated by tabs in header
// and joined by tabs in rows, as aligned columns two spaces apart.
func (t *textReport) table(header string, rows [][]string) {
	tw := tabwriter.NewWriter(&t.b, 0, 0, 2, ' ', 0)
	fmt.Fprintln(tw, "  "+header)
	for _, row := range rows {
		fmt.Fprintln(tw, "  "+strings.Join(row, "\t"))
	}
	tw.Flush()
}

// String returns the report written so far.
func (t *textReport) String() string { return t.b.String() }
