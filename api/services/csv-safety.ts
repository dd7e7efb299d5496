/**
 * CSV sent to a browser may be opened in a spreadsheet, which runs a cell that starts with
 * = + - @, a tab or a carriage return as a formula (OWASP, "CSV Injection"); some
 * spreadsheets read the full-width forms ＝ ＋ － ＠ the same way. Such a cell gets a leading
 * apostrophe, so spreadsheets show it as text, unless the whole cell is a plain number
 * ("-0.25", "-0,25", "+3", "-1e-3"): a negative force is data. Anything more after the number
 * ("-2+3+cmd|…", "-0.5*0+HYPERLINK(…)") is a formula and is neutralised.
 *
 * Test-stand files come with commas, semicolons or tabs, and delimiter guessing is
 * unreliable on short files with decimal commas, so a field start is taken after ANY of
 * , ; tab | or a line break, quoted or not, and a cell runs to the next of them. Inside a
 * quoted text that only adds an apostrophe to the text; the numbers, delimiters and line
 * ends are untouched.
 */

/** A cell a spreadsheet would run as a formula begins with one of these (after any spaces). */
export const FORMULA_START = /^ *[=+\-@\t\r\uFF1D\uFF0B\uFF0D\uFF20]/
/** A whole cell that is one plain number, decimal point or comma, optional exponent. */
const PLAIN_NUMBER = /^ *[-+]?(?:\d+(?:[.,]\d*)?|[.,]\d+)(?:[eE][-+]?\d+)? *$/
const DELIMITERS = new Set([',', ';', '\t', '|', '\n'])

/** True when a spreadsheet would run the cell's text as a formula. */
export function isFormulaCell(cell: string): boolean {
  return FORMULA_START.test(cell) && !PLAIN_NUMBER.test(cell)
}

export function neutraliseCsvFormulae(text: string): string {
  const out: string[] = []
  let copied = 0
  const guard = (at: number) => {
    out.push(text.slice(copied, at), "'")
    copied = at
  }
  for (let start = 0; start <= text.length; start++) {
    if (start > 0 && !DELIMITERS.has(text[start - 1])) continue
    if (text[start] === '"') {
      // a quoted cell runs to the closing quote ("" inside is an escaped quote)
      let end = start + 1
      while (end < text.length && !(text[end] === '"' && text[end + 1] !== '"')) end += text[end] === '"' ? 2 : 1
      if (isFormulaCell(text.slice(start + 1, end).replace(/""/g, '"'))) guard(start + 1)
      continue
    }
    let end = start
    while (end < text.length && !DELIMITERS.has(text[end])) end++
    // a tab is a delimiter or leading white space: read as white space, the cell runs on
    // past it, and an apostrophe in front covers that reading too
    if (text[start] === '\t') {
      let next = start
      while (next < text.length && (text[next] === '\t' || text[next] === ' ')) next++
      let rest = next
      while (rest < text.length && !DELIMITERS.has(text[rest])) rest++
      if (rest > next && isFormulaCell(text.slice(next, rest).replace(/\r$/, ''))) guard(start)
      continue
    }
    let cell = text.slice(start, end)
    if (cell.endsWith('\r') && text[end] === '\n') cell = cell.slice(0, -1)
    if (cell && isFormulaCell(cell)) guard(start)
  }
  out.push(text.slice(copied))
  return out.join('')
}
