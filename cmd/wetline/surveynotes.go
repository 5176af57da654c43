package main

import (
	"slices"
	"strings"

	"wetline/rating/reach"
	"wetline/survey"
)

// projectionPhrase begins, after the survey's position, the survey
// reader's statement of how a coordinate survey's stations were made
// ("hr-1-coords.csv:4: stations were projected from eastings and northings
// onto ...").
const projectionPhrase = ": stations were projected from eastings and northings onto "

// moveSurveyNotes takes the reader's statement of how each coordinate
// survey of a reach was projected out of the reach's warnings and gives it
// to its section as Section.SurveyNote (without the position, which the
// survey column names), for the reports' inputs: it is a fact of the
// inputs on every such run, not a warning. The warnings of points far off
// the line, a line turned or pins disagreeing stay warnings.
func moveSurveyNotes(rt *survey.Reach, secs []reach.Section) {
	for i := range min(len(rt.Surveys), len(rt.Rows), len(secs)) {
		sv := rt.Surveys[i]
		if sv.Projection.Line == "" {
			continue
		}
		for _, w := range sv.Warnings {
			at := strings.Index(w, projectionPhrase)
			if at < 0 {
				continue
			}
			secs[i].SurveyNote = w[at+2:]
			full := "section " + rt.Rows[i].ID + ": " + w
			rt.Warnings = slices.DeleteFunc(rt.Warnings, func(s string) bool { return s == full })
		}
	}
}
