package survey

import (
	"slices"
	"strings"
	"testing"
)

// Of a code and a description, the one not read as the marks is the
// crew's text of each point (thalweg, rew, rebar): it is kept as the
// point's note, after the note column's text when both are written
// (README, Bank marks). Surveys by station and coordinate surveys alike;
// a coordinate survey taken right to left keeps each note with its point
// in station order. The layouts are a data collector's export (common
// practice); the values are invented.
func TestOtherMarkColumnIsNote(t *testing.T) {
	for _, tc := range []struct {
		name, csv string
		want      []string
	}{
		{"code with banks, description free text",
			"station,elevation,code,description\n0,12,GND,left end\n2,11,LB,left bank top\n6,9,GND,thalweg\n10,11.1,RB,\n12,12.1,GND,right end\n",
			[]string{"left end", "left bank top", "thalweg", "", "right end"}},
		{"description with banks, numeric code",
			"station,elevation,pt code,desc\n0,12,1,lpin\n2,11,2,LTOB\n6,9,3,\n10,11.1,4,RTOB\n12,12.1,,rpin\n",
			[]string{"1", "2", "3", "4", ""}},
		{"a note column too",
			"station,elevation,code,description,note\n0,12,GND,rebar,found bent\n2,11,LB,, \n6,9,GND,thalweg,\n10,11.1,RB,,soft\n12,12.1,GND,,\n",
			[]string{"found bent; rebar", "", "thalweg", "soft", ""}},
		{"coordinate survey right to left",
			"easting (ft),northing (ft),elevation (ft),point code,description\n130,0,108,RPIN,right pin\n100,0,104,RTOB,\n70,0,99.8,,thalweg\n40,0,104.6,LTOB,\n10,0,108.2,LPIN,left pin rebar\n",
			[]string{"left pin rebar", "", "thalweg", "", "right pin"}},
	} {
		t.Run(tc.name, func(t *testing.T) {
			sv, err := ParseSection(strings.NewReader(tc.csv), "s.csv", SectionOptions{})
			if err != nil {
				t.Fatal(err)
			}
			if !slices.Equal(sv.Notes, tc.want) {
				t.Errorf("notes %q, want %q", sv.Notes, tc.want)
			}
			if !sv.Section.HasBanks {
				t.Error("the banks were not read")
			}
		})
	}
}
