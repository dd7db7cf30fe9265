// Package workbook writes spreadsheets (Office Open XML .xlsx) from typed rows: sheets with a
// bold, frozen header row that carries each column's unit, numbers stored as numbers with a
// fixed number of decimals shown, money stored in currency units with two decimals, booleans,
// formulas and column widths.
//
// It is the only package of the module that imports excelize, so every .xlsx the tool writes
// (the sweep's compare.xlsx, the plan's bill of materials) looks and behaves the same.
//
// Output is byte-stable: the same workbook always gives the same bytes (no timestamps, styles
// created in a fixed order). Each formula is stored with its result, worked out by the caller,
// as the cell's cached value, so that readers that do not calculate (openpyxl's data_only,
// pandas, previewers) see it; the workbook still asks the spreadsheet program to recalculate
// every formula when the file is opened.
package workbook
