package survey_test

import (
	"fmt"
	"strings"

	"wetline/survey"
)

// A stage–discharge table of the last section of a reach, as rate writes
// it, read for the downstream boundary of a step-backwater computation:
// of the rows at the dry bed only the last is kept.
func ExampleBoundaryRatingFromTable() {
	t, err := survey.ParseCSV(strings.NewReader("stage,depth,discharge\n100.05,0,0\n100.10,0.05,0\n100.50,0.45,1.2\n101.00,0.95,6.5\n"), "xs3-rating.csv")
	if err != nil {
		fmt.Println(err)
		return
	}
	b, err := survey.BoundaryRatingFromTable(t)
	if err != nil {
		fmt.Println(err)
		return
	}
	for i, p := range b.Points {
		fmt.Printf("line %d: stage %.2f m, discharge %.1f m3/s\n", b.Rows[i], p.Stage, p.Discharge)
	}
	// Output:
	// line 3: stage 100.10 m, discharge 0.0 m3/s
	// line 4: stage 100.50 m, discharge 1.2 m3/s
	// line 5: stage 101.00 m, discharge 6.5 m3/s
}
