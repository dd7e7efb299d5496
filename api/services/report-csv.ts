/**
 * Reading a test stand's CSV into a measured curve: content checks (text, not a renamed
 * binary), delimiter and header detection, column mapping, unit conversion to the
 * entry's axes, and the checks a loading stroke must pass. Every problem names the row and
 * column it was found in (rows and columns counted from 1, as a spreadsheet shows them).
 */
import Papa from 'papaparse'
import type { MeasuredCurve } from '../db/models/test-report'
import { displacementFactor, forceFactor, type DisplacementUnit, type ForceUnit } from '../../catalog/units'

const MIN_POINTS = 5
/**
 * Most data rows one report may hold. A test stand logging at 10 Hz over a 15-minute stroke
 * writes 9,000; every figure drawn or fitted from a report needs far fewer. A 110k-row file
 * made the review queue take seconds and answer megabytes (issue 11).
 */
export const MAX_REPORT_ROWS = 10_000

export interface CsvProblem {
  field: string
  message: string
  row: number | null
  column: number | null
}

export class CsvError extends Error {
  readonly problem: CsvProblem
  constructor(problem: CsvProblem) {
    super(problem.message)
    this.name = 'CsvError'
    this.problem = problem
  }
}

export interface CsvOptions {
  displacementColumn?: string
  forceColumn?: string
  displacementUnit: DisplacementUnit
  forceUnit: ForceUnit
  hasHeader: 'auto' | 'yes' | 'no'
}

export interface ParsedCsv {
  curve: MeasuredCurve
  header: string[] | null
  delimiter: string
  columns: { displacement: { index: number; name: string | null }; force: { index: number; name: string | null } }
}

const fail = (message: string, row: number | null = null, column: number | null = null): never => {
  throw new CsvError({ field: 'file', message, row, column })
}

/** Files people pick by mistake, recognised by their first bytes. */
const BINARY_SIGNATURES: Array<{ bytes: number[]; kind: string }> = [
  { bytes: [0x89, 0x50, 0x4e, 0x47], kind: 'a PNG image' },
  { bytes: [0xff, 0xd8, 0xff], kind: 'a JPEG image' },
  { bytes: [0x47, 0x49, 0x46, 0x38], kind: 'a GIF image' },
  { bytes: [0x25, 0x50, 0x44, 0x46], kind: 'a PDF document' },
  { bytes: [0x50, 0x4b, 0x03, 0x04], kind: 'a ZIP archive (an .xlsx workbook is one; export it as CSV)' },
  { bytes: [0xd0, 0xcf, 0x11, 0xe0], kind: 'an Office document (export it as CSV)' },
]

/** The file as text, or a clear refusal when its content is not text. */
function decodeText(buffer: Buffer): string {
  if (buffer.length === 0) fail('the file is empty')
  for (const sig of BINARY_SIGNATURES) {
    if (sig.bytes.every((b, i) => buffer[i] === b)) fail(`the file is ${sig.kind}, not a CSV text file`)
  }
  let text: string
  try {
    text = new TextDecoder('utf-8', { fatal: true }).decode(buffer)
  } catch {
    // older stand software writes Windows-1252 ("°", "µ" in headers); Latin-1 reads every byte
    text = buffer.toString('latin1')
  }
  if (text.charCodeAt(0) === 0xfeff) text = text.slice(1)
  const control = /[\u0000-\u0008\u000b\u000c\u000e-\u001f\u007f]/.exec(text)
  if (control) {
    const row = text.slice(0, control.index).split('\n').length
    fail(`the file is not a CSV text file: it holds binary data (first at row ${row})`, row)
  }
  if (text.trim() === '') fail('the file is empty (no rows)')
  return text
}

/** Semicolons (with decimal commas), tabs or commas: the first that splits every one of the first lines alike. */
function detectDelimiter(lines: string[]): string {
  const sample = lines.filter((l) => l.trim() !== '').slice(0, 20)
  for (const d of [';', '\t', ',', '|']) {
    const counts = sample.map((l) => l.split(d).length - 1)
    if (counts.length && counts[0] > 0 && counts.every((c) => c === counts[0])) return d
  }
  for (const d of [';', '\t', ',', '|']) if (sample.every((l) => l.includes(d))) return d
  return ','
}

const NUMBER = /^[+-]?(\d+\.?\d*|\.\d+)([eE][+-]?\d+)?$/

function parseNumber(cell: string, decimalComma: boolean): number | null {
  let text = cell.trim()
  if (decimalComma && /^[+-]?\d*,\d+([eE][+-]?\d+)?$/.test(text)) text = text.replace(',', '.')
  if (!NUMBER.test(text)) return null
  const n = Number(text)
  return Number.isFinite(n) ? n : null
}

function resolveColumn(given: string | undefined, fallback: number, header: string[] | null, which: string, guess: RegExp): number {
  const field = `${which}Column`
  if (given === undefined || given.trim() === '') {
    if (header) {
      const found = header.findIndex((h) => guess.test(h))
      if (found >= 0) return found
    }
    return fallback
  }
  const text = given.trim()
  if (/^\d+$/.test(text)) {
    const index = Number(text) - 1
    if (index < 0) throw new CsvError({ field, message: `${field}: columns are counted from 1`, row: null, column: null })
    return index
  }
  if (!header) throw new CsvError({ field, message: `${field} names the column "${text}", but the file has no header row; give the column number instead`, row: null, column: null })
  const index = header.findIndex((h) => h.trim().toLowerCase() === text.toLowerCase())
  if (index < 0) throw new CsvError({ field, message: `${field}: no column is headed "${text}" (the header has ${header.map((h) => `"${h.trim()}"`).join(', ')})`, row: 1, column: null })
  return index
}

/** Parses and checks a loading stroke; answers the curve in mm and N (or deg and N·mm). */
export function parseMeasuredCurve(buffer: Buffer, options: CsvOptions): ParsedCsv {
  const text = decodeText(buffer)
  const lines = text.split(/\r\n|\n|\r/)
  // counted before anything is parsed, so a huge file costs one pass over its line ends
  const nonEmpty = lines.reduce((n, l) => (l.trim() === '' ? n : n + 1), 0)
  if (nonEmpty > MAX_REPORT_ROWS + 1) {
    fail(`the file has ${nonEmpty} rows; a test report may hold at most ${MAX_REPORT_ROWS} data rows (plus a header): resample the stroke or export fewer points`)
  }
  const delimiter = detectDelimiter(lines)
  const parsed = Papa.parse<string[]>(text, { delimiter, skipEmptyLines: false, header: false })
  // rows keep their line number, so a message can point at the row the user sees
  const rows = parsed.data.map((cells, i) => ({ line: i + 1, cells })).filter((r) => r.cells.some((c) => c.trim() !== ''))
  if (rows.length === 0) fail('the file is empty (no rows)')

  const decimalComma = delimiter !== ','
  const first = rows[0]
  const looksLikeHeader = first.cells.slice(0, Math.max(2, first.cells.length)).some((c) => c.trim() !== '' && parseNumber(c, decimalComma) === null)
  const hasHeader = options.hasHeader === 'yes' || (options.hasHeader === 'auto' && looksLikeHeader)
  const header = hasHeader ? first.cells.map((c) => c.trim()) : null
  const data = hasHeader ? rows.slice(1) : rows
  if (data.length > MAX_REPORT_ROWS) {
    fail(`the file has ${data.length} data rows; a test report may hold at most ${MAX_REPORT_ROWS}: resample the stroke or export fewer points`)
  }

  const dIndex = resolveColumn(options.displacementColumn, 0, header, 'displacement', /displacement|extension|travel|position|stroke|deflection|rotation|angle/i)
  const fIndex = resolveColumn(options.forceColumn, 1, header, 'force', /force|load|moment|torque/i)
  if (dIndex === fIndex) throw new CsvError({ field: 'forceColumn', message: `the displacement and force columns are the same column (${dIndex + 1})`, row: null, column: dIndex + 1 })
  const widest = Math.max(...rows.map((r) => r.cells.length))
  for (const [index, which] of [[dIndex, 'displacement'], [fIndex, 'force']] as const) {
    if (index >= widest) throw new CsvError({ field: `${which}Column`, message: `${which}Column: the file has ${widest} column(s), so there is no column ${index + 1}`, row: null, column: index + 1 })
  }
  const label = (index: number) => `column ${index + 1}${header?.[index] ? ` (${header[index]})` : ''}`

  for (const index of [dIndex, fIndex]) {
    if (data.length > 0 && data.every((r) => (r.cells[index] ?? '').trim() === '')) {
      fail(`${label(index)} is empty: no values in any row`, data[0].line, index + 1)
    }
  }
  const displacement: number[] = []
  const force: number[] = []
  const lengthFactor = displacementFactor(options.displacementUnit)
  const forceScale = forceFactor(options.forceUnit)
  let previous = 0
  for (const row of data) {
    const values: number[] = []
    for (const index of [dIndex, fIndex]) {
      const cell = row.cells[index] ?? ''
      if (cell.trim() === '') fail(`row ${row.line}, ${label(index)} is empty`, row.line, index + 1)
      const value = parseNumber(cell, decimalComma)
      if (value === null) fail(`row ${row.line}, ${label(index)}: "${cell.trim().slice(0, 40)}" is not a number`, row.line, index + 1)
      values.push(value!)
    }
    const d = values[0] * lengthFactor
    if (displacement.length && d < displacement[displacement.length - 1]) {
      fail(`row ${row.line}, ${label(dIndex)}: the displacement falls from ${previous} to ${values[0]}; a loading stroke must not go back (put the unloading stroke in a file of its own)`, row.line, dIndex + 1)
    }
    previous = values[0]
    displacement.push(d)
    force.push(values[1] * forceScale)
  }
  if (displacement.length < MIN_POINTS) {
    fail(`the file has ${displacement.length} data row(s); a measured curve needs at least ${MIN_POINTS}`, data.length ? data[data.length - 1].line : first.line, null)
  }
  return {
    curve: { displacement, force },
    header,
    delimiter,
    columns: { displacement: { index: dIndex + 1, name: header?.[dIndex] ?? null }, force: { index: fIndex + 1, name: header?.[fIndex] ?? null } },
  }
}
