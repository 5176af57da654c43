package survey

import (
	"bufio"
	"bytes"
	"encoding/csv"
	"fmt"
	"io"
	"math"
	"strings"

	"wetline/rating"
)

// Metadata keys read above a table: "# site: Tallow Creek at Mill Lane"
// in a CSV file, or a row "site | Tallow Creek at Mill Lane" above a
// sheet's header.
const (
	MetaSite     = "site"
	MetaSiteID   = "site id"
	MetaSurveyed = "surveyed"
	MetaDatum    = "datum"
	MetaCrew     = "crew"
)

// BuiltPrefix begins the comment line the shape command writes above a
// built section ("# Built section rectangle:width=5, lengths in m; ...").
// A CSV file with such a line, or a sheet with such a comment row above
// its header, has Meta[MetaBuilt] set to the rest of it.
const (
	BuiltPrefix = "Built section "
	MetaBuilt   = "built"
)

// MetaKeys returns the metadata keys in their usual order.
func MetaKeys() []string {
	return []string{MetaSite, MetaSiteID, MetaSurveyed, MetaDatum, MetaCrew}
}

// metaKey normalises a metadata key ("Site-ID", "site_id" are "site id"),
// and reports whether it is one of MetaKeys.
func metaKey(s string) (string, bool) {
	k := strings.ToLower(strings.TrimSpace(strings.TrimSuffix(strings.TrimSpace(s), ":")))
	k = strings.Join(strings.FieldsFunc(k, func(r rune) bool { return r == ' ' || r == '_' || r == '-' }), " ")
	for _, m := range MetaKeys() {
		if k == m {
			return k, true
		}
	}
	return "", false
}

// csvMeta reads "# key: value" comment lines above the header of CSV text.
func csvMeta(data []byte) map[string]string {
	var meta map[string]string
	sc := bufio.NewScanner(bytes.NewReader(data))
	sc.Buffer(nil, 1<<20)
	for sc.Scan() {
		line := strings.TrimSpace(sc.Text())
		if line == "" {
			continue
		}
		if !strings.HasPrefix(line, "#") {
			break // the header: key lines stand above it
		}
		meta = addMetaLine(meta, line)
	}
	return meta
}

// addMetaLine adds a "# key: value" comment line (trimmed, starting with
// '#') to meta when its key is one of MetaKeys, or the line the shape
// command writes (BuiltPrefix, as MetaBuilt), making the map if nil, and
// returns meta; other lines leave it as it is. A sheet's comment row
// comes here as a CSV file's line does, so that a built section saved
// as a workbook is still known as built.
func addMetaLine(meta map[string]string, line string) map[string]string {
	if rest, built := strings.CutPrefix(strings.TrimSpace(strings.TrimPrefix(line, "#")), BuiltPrefix); built {
		if meta == nil {
			meta = map[string]string{}
		}
		meta[MetaBuilt] = rest
		return meta
	}
	k, v, ok := strings.Cut(strings.TrimPrefix(line, "#"), ":")
	if !ok {
		return meta
	}
	if key, known := metaKey(k); known {
		if meta == nil {
			meta = map[string]string{}
		}
		meta[key] = keyValue(v)
	}
	return meta
}

// keyValue is the value of a key line, trimmed, without the empty CSV
// fields a spreadsheet program adds when it saves the line as a row of a
// wider table ("# site: Quillback Run,," reads "Quillback Run").
func keyValue(v string) string {
	return strings.TrimRight(strings.TrimSpace(v), ", \t")
}

// siteOf is the site metadata of a map of MetaKeys.
func siteOf(m map[string]string) rating.Site {
	return rating.Site{Name: m[MetaSite], ID: m[MetaSiteID], Surveyed: m[MetaSurveyed], Datum: m[MetaDatum], Crew: m[MetaCrew]}
}

// commentRow reports a sheet row that is a comment line, as a CSV file's
// '#' lines are (a CSV output opened in a spreadsheet keeps them as rows):
// its first cell starts with '#' and, below the header (belowHeader), no
// other cell holds anything, so that a data row whose first cell is a
// number such as #3 is read as data. line is the row's cells joined as
// the CSV line they were split from, trailing blank cells dropped, for
// addMetaLine.
func commentRow(rec []string, belowHeader bool) (line string, ok bool) {
	if len(rec) == 0 || !strings.HasPrefix(strings.TrimSpace(rec[0]), "#") {
		return "", false
	}
	cells := trimAll(rec)
	for len(cells) > 0 && cells[len(cells)-1] == "" {
		cells = cells[:len(cells)-1]
	}
	if belowHeader && len(cells) > 1 {
		return "", false
	}
	return strings.Join(cells, ","), true
}

// commentedData returns the numbers of the lines of CSV text below its
// header (on line headerRow) that start with '#', and so are comments,
// but hold two or more values after the first field, as a data row does
// ("#3,2024-05-01,1.2,3.4"): a '#' numbering a row hides it. The lines
// are told as ParseCSV's encoding/csv reader tells them: a line inside a
// quoted field ("a note\n#2 pools, riffle") is part of its record, not a
// comment, and a comment line's fields are split as a record's (a quoted
// comma does not part two values). Text that encoding/csv cannot read is
// told up to the fault (ParseCSV refuses it).
func commentedData(data []byte, headerRow int) []int {
	if !bytes.Contains(data, []byte("\n#")) {
		return nil
	}
	cr := csv.NewReader(bytes.NewReader(data))
	cr.Comment = '#'
	cr.FieldsPerRecord = -1
	cr.TrimLeadingSpace = true
	cr.ReuseRecord = true
	var out []int
	line, off := 1, 0 // off is the first byte of line
	// comments looks at the lines from line up to before, which the
	// reader passed over: blank lines and comments.
	comments := func(before int) {
		for line < before && off < len(data) {
			end := len(data)
			if j := bytes.IndexByte(data[off:], '\n'); j >= 0 {
				end = off + j
			}
			if text := data[off:end]; line > headerRow && bytes.HasPrefix(text, []byte("#")) && lineValues(text) >= 2 {
				out = append(out, line)
			}
			line, off = line+1, end+1
		}
	}
	for {
		_, err := cr.Read()
		if err != nil {
			if err == io.EOF {
				comments(math.MaxInt)
			}
			return out
		}
		start, _ := cr.FieldPos(0)
		comments(start)
		end := int(cr.InputOffset())
		line += bytes.Count(data[off:end], []byte("\n"))
		off = end
	}
}

// lineValues counts the fields after the first of one line of CSV text
// that are not blank, the fields split as encoding/csv splits a record
// (quotes taken loosely, as the line is a comment).
func lineValues(text []byte) int {
	r := csv.NewReader(bytes.NewReader(text))
	r.FieldsPerRecord = -1
	r.LazyQuotes = true
	r.TrimLeadingSpace = true
	rec, err := r.Read()
	if err != nil {
		rec = strings.Split(string(text), ",")
	}
	n := 0
	for i := 1; i < len(rec); i++ {
		if strings.TrimSpace(rec[i]) != "" {
			n++
		}
	}
	return n
}

// siteRow takes a row that belongs to no table: in a sheet (inSheet) a
// comment row (commentRow), and above the header (belowHeader false) a
// key row of the site block (metaRow). What the row says of the site is
// added to meta (made when nil), which is returned with whether the row
// was taken and the columns (0-based) of a key row's cells to the right
// of its value, which are not read (see metaRow). Every table reader sets
// its rows aside here.
func siteRow(meta map[string]string, rec []string, inSheet, belowHeader bool) (map[string]string, []int, bool) {
	if inSheet {
		if line, ok := commentRow(rec, belowHeader); ok {
			if !belowHeader {
				meta = addMetaLine(meta, line)
			}
			return meta, nil, true
		}
	}
	if belowHeader {
		return meta, nil, false
	}
	k, v, extra, ok := metaRow(rec)
	if !ok {
		return meta, nil, false
	}
	if meta == nil {
		meta = map[string]string{}
	}
	meta[k] = v
	return meta, extra, true
}

// metaRow reads a sheet row above the header as a key and its value: the
// first cell one of MetaKeys (a trailing colon allowed), the second its
// value. Cells to the right of the value (a title or a page number the
// crew wrote beside the site block) do not stop the row being a key row:
// they are not read, and their columns (0-based) are returned in extra
// for the reader's warning, so long as a blank cell stands between the
// value and them. A row whose third cell is written (site, time, stage,
// discharge) is a header whose first column happens to be named as a key,
// not a key row: a crew's title stands apart from the block, while a
// header's names follow one another.
func metaRow(rec []string) (key, value string, extra []int, ok bool) {
	cells := trimAll(rec)
	for len(cells) > 0 && cells[len(cells)-1] == "" {
		cells = cells[:len(cells)-1]
	}
	if len(cells) < 1 {
		return "", "", nil, false
	}
	key, ok = metaKey(cells[0])
	if !ok {
		return "", "", nil, false
	}
	if len(cells) >= 2 {
		value = cells[1]
	}
	if len(cells) >= 3 && cells[2] != "" {
		return "", "", nil, false
	}
	for c := 2; c < len(cells); c++ {
		if cells[c] != "" {
			extra = append(extra, c)
		}
	}
	return key, value, extra, true
}

// siteExtrasWarning is the warning of the cells to the right of the
// values of a site block's key rows (cells, each as "G1"), which are not
// read; "" when there are none. where is the file, or the file and sheet.
func siteExtrasWarning(where string, cells []string) string {
	if len(cells) == 0 {
		return ""
	}
	return fmt.Sprintf("%s: %s to the right of the site block's %s (%s) %s not read", where,
		rating.Counted(len(cells), "cell", "cells"), rating.Agree(len(cells), "value", "values"), strings.Join(cells, ", "), rating.Agree(len(cells), "is", "are"))
}

// Site returns the site metadata read above the table.
func (t *Table) Site() rating.Site {
	return siteOf(t.Meta)
}

// fieldNames names the fields (0-based cols) of a CSV line for a warning:
// "line 1 field 7".
func fieldNames(line int, cols []int) []string {
	out := make([]string, len(cols))
	for i, c := range cols {
		out[i] = fmt.Sprintf("line %d field %d", line, c+1)
	}
	return out
}
