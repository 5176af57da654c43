package results_test

import (
	"bytes"
	"fmt"

	"wetline/survey"
	"wetline/survey/workbook"
)

// A table sheet written with units and number formats reads back by its
// column names.
func ExampleBook() {
	b := workbook.NewBook()
	defer b.Close()
	s, err := b.Table("gaugings", []workbook.Column{
		{Name: "stage", Unit: "m", Format: "0.000"},
		{Name: "discharge", Unit: "m3/s", Format: workbook.FormatSig3},
		{Name: "quality"},
	})
	if err != nil {
		fmt.Println(err)
		return
	}
	s.Row(1.25, 3.412, "good")
	s.Row(1.6, 17.93, "fair")
	if err := s.Flush(); err != nil {
		fmt.Println(err)
		return
	}
	var buf bytes.Buffer
	if err := b.Write(&buf); err != nil {
		fmt.Println(err)
		return
	}
	tab, err := survey.ParseWorkbook(&buf, "gaugings.xlsx", "")
	if err != nil {
		fmt.Println(err)
		return
	}
	fmt.Println(tab.Header, "discharge is column", tab.Column("discharge"))
	for _, rec := range tab.Records {
		fmt.Println(rec.Row, rec.Cells)
	}
	// Output:
	// [stage (m) discharge (m3/s) quality] discharge is column 1
	// 2 [1.25 3.412 good]
	// 3 [1.6 17.93 fair]
}

// Discharges are shown to three significant figures, never with fewer
// than whole units.
func ExampleSig3Decimals() {
	for _, q := range []float64{1234.6, 123.46, 12.346, 1.2346, 0.012346} {
		fmt.Printf("%.*f\n", workbook.Sig3Decimals(q), q)
	}
	// Output:
	// 1235
	// 123
	// 12.3
	// 1.23
	// 0.0123
}
