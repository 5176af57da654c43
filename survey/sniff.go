package survey

import (
	"bytes"
	"io"
	"math"
)

// sniffCSVBytes bounds how much of a CSV file SniffCSV reads.
const sniffCSVBytes = 16 << 10

// Sniff is what SniffCSV tells of a CSV file from its first lines.
type Sniff struct {
	// Other names the kind of table its header plainly makes it when
	// that is not a survey ("a reach table", "a table of gaugings", "a
	// rating table", "a table of shift diagrams", "a stage record"); ""
	// for a survey, or a table of no kind known (read as a survey, its
	// reader says what is wrong).
	Other string
	// Projected reports a survey by station that also gives eastings and
	// northings: a coordinate survey projected onto its line and written
	// as stations.
	Projected bool
	// Points are the eastings and northings of its first rows read (at
	// most a few hundred), for a coordinate survey or a projected one.
	Points [][2]float64
}

// SniffCSV reads the first lines of a CSV file (at most 16 KiB) and tells
// what kind of table its header names (see Sniff), without reading the
// rest; the error is the file's when it cannot be read as a table.
func SniffCSV(path string) (Sniff, error) {
	if path == Stdin { // read once, whole, and kept for its reader
		data, err := readInput(path)
		if err != nil {
			return Sniff{}, err
		}
		return sniffHead(data[:min(len(data), sniffCSVBytes)], path)
	}
	rc, _, err := openInput(path)
	if err != nil {
		return Sniff{}, err
	}
	defer rc.Close()
	head, err := io.ReadAll(io.LimitReader(rc, sniffCSVBytes))
	if err != nil {
		return Sniff{}, &ParseError{File: path, Err: err}
	}
	return sniffHead(head, path)
}

// sniffHead tells what the head of a CSV file (at most sniffCSVBytes of
// it) names.
func sniffHead(head []byte, path string) (Sniff, error) {
	if len(head) == sniffCSVBytes {
		if i := bytes.LastIndexByte(head, '\n'); i > 0 {
			head = head[:i+1]
		}
	}
	t, err := ParseCSV(bytes.NewReader(head), path)
	if err != nil {
		return Sniff{}, err
	}
	return sniffTable(t), nil
}

// sniffTable tells what a table's header names.
func sniffTable(t *Table) Sniff {
	var s Sniff
	kind, coords := KindOf(t), hasCoordinates(t)
	switch {
	case kind == KindSection:
		s.Projected = coords && t.Column(ColStation) >= 0
	case kind == KindBoth:
	case t.Column(ReachColSection) >= 0 && t.Column(ReachColSurvey) >= 0 && t.Column(ReachColDistance) >= 0:
		s.Other = "a reach table"
	case kind == KindRating && t.Column(ColGaugingTime) >= 0:
		s.Other = "a table of gaugings"
	case kind == KindRating:
		s.Other = "a rating table"
	case t.Column(ColShiftTime) >= 0 && t.Column(ColShiftStage, ColGaugeHeight) >= 0 && t.Column(ColShift) >= 0:
		s.Other = "a table of shift diagrams"
	case t.Column(ColRecordTime) >= 0 && t.Column(ColRecordStage, ColGaugeHeight) >= 0:
		s.Other = "a stage record"
	}
	if kind == KindSection && coords {
		ce, cn := t.Column(ColEasting, "x"), t.Column(ColNorthing, "y")
		for _, rec := range t.Records {
			e, okE, errE := t.Float(rec, ce)
			n, okN, errN := t.Float(rec, cn)
			if okE && okN && errE == nil && errN == nil && !math.IsNaN(e+n) {
				s.Points = append(s.Points, [2]float64{e, n})
			}
		}
	}
	return s
}
