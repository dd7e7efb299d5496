/**
 * A first look at a test stand's CSV before it is uploaded: delimiter, header row, which
 * columns look like displacement and force, the first rows, and the first cell that would
 * be refused. The server reads the file again and its verdict wins; this preview only
 * lets the contributor pick the columns and units with the data in view.
 */
import Papa from 'papaparse'
import { displacementFactor, forceFactor } from '@catalog/units'

export const PREVIEW_ROWS = 8
const MIN_POINTS = 5

export interface CsvPreview {
  delimiter: string
  /** Header cells when the first row is not numbers. */
  header: string[] | null
  /** Data rows with their line number in the file (1-based, as a spreadsheet shows them). */
  rows: Array<{ line: number; cells: string[] }>
  columnCount: number
  /** Guessed column indexes (0-based). */
  guess: { displacement: number; force: number }
}

export interface CsvProblem {
  message: string
  row: number | null
  column: number | null
}

const DELIMITERS = [';', '\t', ',', '|']

/** The delimiter that splits the first non-empty lines alike (semicolon files use decimal commas). */
export function detectDelimiter(lines: readonly string[]): string {
  const sample = lines.filter((l) => l.trim() !== '').slice(0, 20)
  for (const d of DELIMITERS) {
    const counts = sample.map((l) => l.split(d).length - 1)
    if (counts.length && counts[0] > 0 && counts.every((c) => c === counts[0])) return d
  }
  for (const d of DELIMITERS) if (sample.length && sample.every((l) => l.includes(d))) return d
  return ','
}

const NUMBER = /^[+-]?(\d+\.?\d*|\.\d+)([eE][+-]?\d+)?$/

export function parseCell(cell: string, decimalComma: boolean): number | null {
  let text = cell.trim()
  if (decimalComma && /^[+-]?\d*,\d+([eE][+-]?\d+)?$/.test(text)) text = text.replace(',', '.')
  if (!NUMBER.test(text)) return null
  const n = Number(text)
  return Number.isFinite(n) ? n : null
}

const DISPLACEMENT_WORDS = /displacement|extension|travel|position|stroke|deflection|rotation|angle|\bmm\b|\bin\b/i
const FORCE_WORDS = /force|load|moment|torque|\bN\b|lbf|gf/i

/** The header's best guess for each column, else the first two columns. */
export function guessColumns(header: readonly string[] | null, columnCount: number): { displacement: number; force: number } {
  let displacement = header ? header.findIndex((h) => DISPLACEMENT_WORDS.test(h) && !/force|load|moment/i.test(h)) : -1
  let force = header ? header.findIndex((h, i) => i !== displacement && FORCE_WORDS.test(h)) : -1
  if (displacement < 0) displacement = force === 0 ? 1 : 0
  if (force < 0 || force === displacement) force = displacement === 1 ? 0 : Math.min(1, columnCount - 1)
  return { displacement, force }
}

/** Reads the text of a CSV; a header is a first row with a cell that is not a number. */
export function previewCsv(text: string, hasHeader: 'auto' | 'yes' | 'no' = 'auto'): CsvPreview {
  const clean = text.charCodeAt(0) === 0xfeff ? text.slice(1) : text
  const delimiter = detectDelimiter(clean.split(/\r\n|\n|\r/))
  const parsed = Papa.parse<string[]>(clean, { delimiter, skipEmptyLines: false, header: false })
  const all = parsed.data.map((cells, i) => ({ line: i + 1, cells })).filter((r) => r.cells.some((c) => c.trim() !== ''))
  const decimalComma = delimiter !== ','
  const first = all[0]
  const looksLikeHeader = !!first && first.cells.some((c) => c.trim() !== '' && parseCell(c, decimalComma) === null)
  const isHeader = hasHeader === 'yes' || (hasHeader === 'auto' && looksLikeHeader)
  const header = isHeader && first ? first.cells.map((c) => c.trim()) : null
  const rows = isHeader ? all.slice(1) : all
  const columnCount = Math.max(0, ...all.map((r) => r.cells.length))
  return { delimiter, header, rows, columnCount, guess: guessColumns(header, columnCount) }
}

export function columnName(preview: Pick<CsvPreview, 'header'>, index: number): string {
  const head = preview.header?.[index]
  return head ? `Column ${index + 1} (${head})` : `Column ${index + 1}`
}

/**
 * The first cell the server would refuse for these columns (empty, not a number, a
 * displacement that goes back), or too few rows; null when the file reads as a loading stroke.
 */
export function firstProblem(preview: CsvPreview, displacement: number, force: number): CsvProblem | null {
  if (displacement === force) return { message: 'The displacement and force columns are the same column.', row: null, column: displacement + 1 }
  const decimalComma = preview.delimiter !== ','
  let last: number | null = null
  for (const row of preview.rows) {
    for (const index of [displacement, force]) {
      const cell = row.cells[index] ?? ''
      if (cell.trim() === '') return { message: `Row ${row.line}, ${columnName(preview, index).toLowerCase()} is empty.`, row: row.line, column: index + 1 }
      if (parseCell(cell, decimalComma) === null) return { message: `Row ${row.line}, ${columnName(preview, index).toLowerCase()}: "${cell.trim().slice(0, 40)}" is not a number.`, row: row.line, column: index + 1 }
    }
    const d = parseCell(row.cells[displacement], decimalComma)!
    if (last !== null && d < last) return { message: `Row ${row.line}: the displacement falls from ${last} to ${d}; a loading stroke must not go back.`, row: row.line, column: displacement + 1 }
    last = d
  }
  if (preview.rows.length < MIN_POINTS) return { message: `The file has ${preview.rows.length} data row(s); a measured curve needs at least ${MIN_POINTS}.`, row: null, column: null }
  return null
}

/** The chosen columns as a curve in mm and N (or deg and N·mm), for the preview plot; null while a cell is refused. */
export function previewCurve(preview: CsvPreview, displacement: number, force: number, displacementUnit: string, forceUnit: string): { displacement: number[]; force: number[] } | null {
  if (firstProblem(preview, displacement, force)) return null
  const decimalComma = preview.delimiter !== ','
  const lf = displacementFactor(displacementUnit)
  const ff = forceFactor(forceUnit)
  return {
    displacement: preview.rows.map((r) => parseCell(r.cells[displacement], decimalComma)! * lf),
    force: preview.rows.map((r) => parseCell(r.cells[force], decimalComma)! * ff),
  }
}

/** The row and column of a refused upload from the server's answer (`details.row`, `details.column`). */
export function serverProblemLocation(details: Record<string, unknown> | null): { row: number | null; column: number | null } {
  const n = (v: unknown) => (typeof v === 'number' && Number.isInteger(v) && v > 0 ? v : null)
  return { row: n(details?.row), column: n(details?.column) }
}
