package workbook

import (
	"bytes"
	"fmt"

	"github.com/xuri/excelize/v2"
)

// Reader reads a .xlsx file back: the values stored in cells, their formulas, and formula
// results worked out by excelize's calculation engine. It lets packages that write
// workbooks check them without importing excelize themselves.
type Reader struct{ f *excelize.File }

// Open reads .xlsx bytes. Close the Reader when done.
func Open(data []byte) (*Reader, error) {
	f, err := excelize.OpenReader(bytes.NewReader(data))
	if err != nil {
		return nil, fmt.Errorf("workbook: open: %w", err)
	}
	return &Reader{f: f}, nil
}

// Close releases the workbook.
func (r *Reader) Close() error { return r.f.Close() }

// Sheets returns the sheet names in order.
func (r *Reader) Sheets() []string { return r.f.GetSheetList() }

// Value returns the value stored in a cell (A1 reference) as text, unformatted: a number
// as its shortest decimal form, a boolean as 1 or 0, a formula cell's cached result (the
// value given to Formula), "" for a blank cell.
func (r *Reader) Value(sheet, ref string) (string, error) {
	v, err := r.f.GetCellValue(sheet, ref, excelize.Options{RawCellValue: true})
	if err != nil {
		return "", fmt.Errorf("workbook: %s!%s: %w", sheet, ref, err)
	}
	return v, nil
}

// Formula returns a cell's formula without the leading "=", or "" when it has none.
func (r *Reader) Formula(sheet, ref string) (string, error) {
	v, err := r.f.GetCellFormula(sheet, ref)
	if err != nil {
		return "", fmt.Errorf("workbook: %s!%s: %w", sheet, ref, err)
	}
	return v, nil
}

// Calc returns the result of a cell's formula, worked out from the cells it refers to as
// they are now, unformatted; for a cell without a formula it returns the stored value.
func (r *Reader) Calc(sheet, ref string) (string, error) {
	v, err := r.f.CalcCellValue(sheet, ref, excelize.Options{RawCellValue: true})
	if err != nil {
		return "", fmt.Errorf("workbook: %s!%s: %w", sheet, ref, err)
	}
	return v, nil
}

// SetNumber stores a number in a cell, as an estimator editing a unit price would; Calc
// then sees it.
func (r *Reader) SetNumber(sheet, ref string, x float64) error {
	if err := r.f.SetCellFloat(sheet, ref, x, -1, 64); err != nil {
		return fmt.Errorf("workbook: %s!%s: %w", sheet, ref, err)
	}
	return nil
}

// Rows returns a sheet's stored values, row by row, as Value gives them; trailing blank
// cells of a row are left out.
func (r *Reader) Rows(sheet string) ([][]string, error) {
	rows, err := r.f.GetRows(sheet, excelize.Options{RawCellValue: true})
	if err != nil {
		return nil, fmt.Errorf("workbook: sheet %q: %w", sheet, err)
	}
	return rows, nil
}
