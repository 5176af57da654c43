package results

import (
	"bufio"
	"fmt"
	"io"
	"math"

	"wetline/rating"
)

// cowanValue writes a table value or range.
func cowanValue(lo, hi float64) string {
	v := fmt.Sprintf("%.3f", lo)
	if hi != lo {
		v += fmt.Sprintf("-%.3f", hi)
	}
	return v
}

// WriteCowanText writes Manning's n by Cowan's method for a reader: the
// site when known, each term with its table value, n and its range, the
// tables' source and the caution.
func WriteCowanText(w io.Writer, in rating.CowanInput, res rating.CowanResult, p rating.Provenance) error {
	bw := bufio.NewWriter(w)
	bw.WriteString(siteLine(p))
	where := "channel"
	if in.Floodplain {
		where = "flood plain"
	}
	fmt.Fprintf(bw, "Manning's n by Cowan's method for a %s, n = (nb + n1 + n2 + n3 + n4)·m:\n", where)
	for _, t := range res.Terms {
		fmt.Fprintf(bw, "  %-3s %-12s %-36s %s\n", t.Factor.Symbol, cowanValue(t.Choice.Lo, t.Choice.Hi), t.Factor.Name, t.Choice.Description)
	}
	fmt.Fprintf(bw, "n = %.3f (range %.3f to %.3f, from the low and high ends of every term)\n", res.N, res.Lo, res.Hi)
	fmt.Fprintf(bw, "values: %s; %s; check them against the paper\n", res.Terms[0].Factor.Table, res.Terms[1].Factor.Table)
	return endSummary(bw, nil)
}

// WriteCowanTables writes the tables of Cowan's method and the keys of
// their rows: the base values (both columns of table 1), the channel and
// the flood-plain adjustments.
func WriteCowanTables(w io.Writer) error {
	bw := bufio.NewWriter(w)
	fmt.Fprintf(bw, "base values (--bed) — %s\n", rating.CowanFactors(false, rating.AnyColumn)[0].Table)
	fmt.Fprintf(bw, "    %-14s %-12s %-12s %s\n", "", "straight", "smooth", "")
	for _, r := range rating.CowanBase() {
		fmt.Fprintf(bw, "    %-14s %-12s %-12s %s\n", r.Key, cowanColumn(r.Straight), cowanColumn(r.Smooth), r.Description)
	}
	for _, group := range []struct {
		title   string
		factors []rating.CowanFactor
	}{
		{"channel adjustments", rating.CowanChannel()},
		{"flood-plain adjustments (--floodplain)", rating.CowanFloodplain()},
	} {
		fmt.Fprintf(bw, "%s — %s\n", group.title, group.factors[0].Table)
		for _, f := range group.factors {
			fmt.Fprintf(bw, "  %s, %s:\n", f.Symbol, f.Name)
			for _, c := range f.Choices {
				fmt.Fprintf(bw, "    %-14s %-12s %s\n", c.Key, cowanValue(c.Lo, c.Hi), c.Description)
			}
		}
	}
	return bw.Flush()
}

// cowanColumn writes one column of table 1, "-" where it has no value.
func cowanColumn(v [2]float64) string {
	if math.IsNaN(v[0]) { // no value in this column
		return "-"
	}
	return cowanValue(v[0], v[1])
}
