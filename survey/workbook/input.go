package workbook

import (
	"fmt"
	"strconv"

	"github.com/xuri/excelize/v2"
)

// RuleKind is the kind of value a validation rule accepts.
type RuleKind int

// Kinds of validation rule.
const (
	// Decimal accepts numbers from Lo to Hi.
	Decimal RuleKind = iota
	// Date accepts date serials from Lo to Hi.
	Date
	// List offers Items in a drop-down list.
	List
)

// Rule is a validation rule on the input cells of a column: what a
// spreadsheet program accepts there and what it says otherwise.
type Rule struct {
	Kind RuleKind
	// Lo and Hi bound a Decimal or Date rule.
	Lo, Hi float64
	// Items are a List rule's choices.
	Items []string
	// Strict refuses a value outside the rule; otherwise the program only
	// warns (and a List only suggests: any text is accepted).
	Strict bool
	// Title and Message are shown on a value outside the rule.
	Title, Message string
}

// InputColumn is a column of an input sheet: its header, its validation
// rule (nil for none) and the prompt shown when a cell is selected.
type InputColumn struct {
	Column
	Rule *Rule
	Help string
}

// KeyRow is a row above an input sheet's header: a key in column A and
// its value (blank for a crew to fill) in column B, which spans the
// sheet's other columns, with a prompt shown when it is selected.
type KeyRow struct {
	Key, Value, Help string
}

// InputSheet adds a sheet for a field crew to fill: a styled, frozen
// header in row 1, input-coloured columns, each column's rule on rows
// 2 … rows+1, and data (if any) from row 2, one []any per row.
func (b *Book) InputSheet(name string, cols []InputColumn, rows int, data [][]any) error {
	return b.KeyedInputSheet(name, nil, cols, rows, data)
}

// KeyedInputSheet is InputSheet with the key rows keys above the header
// (rows 1 … len(keys)): the header, its rules, the data, the frozen panes
// and the rows printed on every page all move down below them.
func (b *Book) KeyedInputSheet(name string, keys []KeyRow, cols []InputColumn, rows int, data [][]any) error {
	if err := b.NewSheet(name); err != nil {
		return err
	}
	f := b.f
	hs, err := b.HeaderStyle()
	if err != nil {
		return err
	}
	head := len(keys) + 1 // the header's row
	hr := strconv.Itoa(head)
	for i, c := range cols {
		col, err := excelize.ColumnNumberToName(i + 1)
		if err != nil {
			return err
		}
		is, err := b.InputStyle(c.Format)
		if err != nil {
			return err
		}
		if err := f.SetColStyle(name, col, is); err != nil {
			return err
		}
		if err := f.SetColWidth(name, col, col, c.Width); err != nil {
			return err
		}
		if err := f.SetCellValue(name, col+hr, c.Header()); err != nil {
			return err
		}
		if err := f.SetCellStyle(name, col+hr, col+hr, hs); err != nil {
			return err
		}
		if c.Rule == nil {
			continue
		}
		dv := excelize.NewDataValidation(true)
		dv.Sqref = fmt.Sprintf("%s%d:%s%d", col, head+1, col, head+rows)
		if err := c.Rule.apply(dv); err != nil {
			return fmt.Errorf("%s column %s: %w", name, c.Name, err)
		}
		if c.Help != "" {
			dv.SetInput(c.Name, c.Help)
		}
		if err := f.AddDataValidation(name, dv); err != nil {
			return err
		}
	}
	// After the column styles, which spread down every cell of a column.
	if err := b.keyRows(name, keys, len(cols)); err != nil {
		return err
	}
	for i, r := range data {
		if err := f.SetSheetRow(name, "A"+strconv.Itoa(head+1+i), &r); err != nil {
			return err
		}
	}
	total := 0.0
	for _, c := range cols {
		total += c.Width
	}
	if err := b.printSetupRows(name, head, head, total); err != nil {
		return err
	}
	if err := f.SetRowHeight(name, head, 30); err != nil {
		return err
	}
	return f.SetPanes(name, &excelize.Panes{Freeze: true, YSplit: head, TopLeftCell: "A" + strconv.Itoa(head+1), ActivePane: "bottomLeft"})
}

// keyRows writes key rows at the top of a sheet of cols columns: each key
// as a label in column A, its value as text in column B merged across the
// other columns, with the key's prompt.
func (b *Book) keyRows(name string, keys []KeyRow, cols int) error {
	if len(keys) == 0 {
		return nil
	}
	ks, err := b.LabelStyle()
	if err != nil {
		return err
	}
	vs, err := b.InputStyle(FormatText)
	if err != nil {
		return err
	}
	last, err := excelize.ColumnNumberToName(max(cols, 2))
	if err != nil {
		return err
	}
	f := b.f
	for i, k := range keys {
		row := strconv.Itoa(i + 1)
		if err := f.SetCellStr(name, "A"+row, k.Key); err != nil {
			return err
		}
		if err := f.SetCellStyle(name, "A"+row, "A"+row, ks); err != nil {
			return err
		}
		if k.Value != "" {
			if err := f.SetCellStr(name, "B"+row, k.Value); err != nil {
				return err
			}
		}
		if err := f.SetCellStyle(name, "B"+row, last+row, vs); err != nil {
			return err
		}
		if err := f.MergeCell(name, "B"+row, last+row); err != nil {
			return err
		}
		if k.Help != "" {
			dv := excelize.NewDataValidation(true)
			dv.Sqref = "B" + row
			dv.SetInput(k.Key, k.Help)
			if err := f.AddDataValidation(name, dv); err != nil {
				return err
			}
		}
	}
	return nil
}

// apply sets the rule on a data validation.
func (r *Rule) apply(dv *excelize.DataValidation) error {
	style := excelize.DataValidationErrorStyleWarning
	if r.Strict {
		style = excelize.DataValidationErrorStyleStop
	}
	switch r.Kind {
	case Decimal:
		if err := dv.SetRange(plainNumber(r.Lo), plainNumber(r.Hi), excelize.DataValidationTypeDecimal, excelize.DataValidationOperatorBetween); err != nil {
			return err
		}
	case Date:
		if err := dv.SetRange(r.Lo, r.Hi, excelize.DataValidationTypeDate, excelize.DataValidationOperatorBetween); err != nil {
			return err
		}
	case List:
		if err := dv.SetDropList(r.Items); err != nil {
			return err
		}
		if !r.Strict {
			return nil // the list only suggests; any text is accepted
		}
	}
	dv.SetError(style, r.Title, r.Message)
	return nil
}

// plainNumber writes v as a formula constant without an exponent.
func plainNumber(v float64) string { return strconv.FormatFloat(v, 'f', -1, 64) }

// Properties are the workbook's document properties.
type Properties struct {
	Title, Subject, Description string
}

// Finish sets the document properties and the sheet the workbook opens
// on ("" keeps the first).
func (b *Book) Finish(p Properties, active string) error {
	if active != "" {
		idx, err := b.f.GetSheetIndex(active)
		if err != nil {
			return err
		}
		if idx < 0 {
			return fmt.Errorf("no sheet %q", active)
		}
		b.f.SetActiveSheet(idx)
	}
	return b.f.SetDocProps(&excelize.DocProperties{Title: p.Title, Subject: p.Subject, Description: p.Description})
}
