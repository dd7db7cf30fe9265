// Package workbook writes spreadsheets (Office Open XML .xlsx) from typed rows: sheets with a
// bold, frozen header row that carries each column's unit, numbers stored as numbers with a
// fixed number of decimals shown, money stored in currency units with two decimals, booleans,
// formulas and column widths.
//
// It is the only package of the module that imports excelize, so every .xlsx the tool writes
// (the sweep's compare.xlsx, the plan's bill of materials) looks and behaves the same.
//
// Output is byte-stable: the same workbook always gives the same bytes (no timestamps, styles
// created in a fixed order). Formulas are stored without a cached result and the workbook asks
// the spreadsheet program to recalculate every formula when the file is opened.
package workbook
