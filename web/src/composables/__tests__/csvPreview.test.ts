import { describe, expect, it } from 'vitest'
import { columnName, detectDelimiter, firstProblem, guessColumns, parseCell, previewCsv, previewCurve, serverProblemLocation } from '../csvPreview'

const stand = ['Time (s),Extension (mm),Load (N)', '0,0,0', '0.5,0.1,0.21', '1,0.2,0.43', '1.5,0.3,0.62', '2,0.4,0.8', '2.5,0.5,0.97'].join('\n')

describe('detectDelimiter', () => {
  it('finds semicolons (decimal-comma files), tabs and commas', () => {
    expect(detectDelimiter(['a;b', '1,5;2,5'])).toBe(';')
    expect(detectDelimiter(['a\tb', '1\t2'])).toBe('\t')
    expect(detectDelimiter(['a,b', '1,2'])).toBe(',')
  })
})

describe('parseCell', () => {
  it('reads plain and exponent numbers, and decimal commas only where asked', () => {
    expect(parseCell(' 1.5e-3 ', false)).toBe(0.0015)
    expect(parseCell('2,5', true)).toBe(2.5)
    expect(parseCell('2,5', false)).toBeNull()
    expect(parseCell('n/a', false)).toBeNull()
    expect(parseCell('', false)).toBeNull()
  })
})

describe('previewCsv', () => {
  it('detects the header and picks the displacement and force columns by their names', () => {
    const observed = previewCsv(stand)
    expect(observed.header).toEqual(['Time (s)', 'Extension (mm)', 'Load (N)'])
    expect(observed.guess).toEqual({ displacement: 1, force: 2 })
    expect(observed.rows).toHaveLength(6)
    expect(observed.rows[0].line).toBe(2) // row numbers as a spreadsheet counts them
    expect(observed.columnCount).toBe(3)
  })

  it('reads a file without a header as data from row 1, columns 1 and 2', () => {
    const observed = previewCsv('0;0\n0,1;0,2\n0,2;0,4')
    expect(observed.header).toBeNull()
    expect(observed.delimiter).toBe(';')
    expect(observed.rows[0].line).toBe(1)
    expect(observed.guess).toEqual({ displacement: 0, force: 1 })
  })

  it('keeps the first row as data when told there is no header', () => {
    expect(previewCsv(stand, 'no').rows).toHaveLength(7)
  })

  it('skips a byte-order mark and blank lines but keeps file line numbers', () => {
    const observed = previewCsv('\ufeffd,f\n\n0,0\n1,2\n')
    expect(observed.header).toEqual(['d', 'f'])
    expect(observed.rows.map((r) => r.line)).toEqual([3, 4])
  })
})

describe('guessColumns', () => {
  it('takes force first when the header puts it first', () => {
    expect(guessColumns(['Force (N)', 'Displacement (mm)'], 2)).toEqual({ displacement: 1, force: 0 })
  })
  it('falls back to columns 1 and 2', () => {
    expect(guessColumns(['a', 'b', 'c'], 3)).toEqual({ displacement: 0, force: 1 })
  })
})

describe('firstProblem', () => {
  it('names the row and column of a cell that is not a number', () => {
    const bad = stand.replace('1,0.2,0.43', '1,0.2,n/a')
    const observed = firstProblem(previewCsv(bad), 1, 2)
    expect(observed).toMatchObject({ row: 4, column: 3 })
    expect(observed?.message).toContain('"n/a" is not a number')
  })
  it('refuses a displacement that goes back on a loading stroke', () => {
    const back = stand.replace('1.5,0.3,0.62', '1.5,0.15,0.62')
    expect(firstProblem(previewCsv(back), 1, 2)).toMatchObject({ row: 5, column: 2 })
  })
  it('refuses an empty cell, the same column twice and too few rows', () => {
    expect(firstProblem(previewCsv(stand.replace('0.5,0.1,0.21', '0.5,,0.21')), 1, 2)).toMatchObject({ row: 3, column: 2 })
    expect(firstProblem(previewCsv(stand), 2, 2)?.message).toContain('same column')
    expect(firstProblem(previewCsv('d,f\n0,0\n1,1'), 0, 1)?.message).toContain('at least 5')
  })
  it('accepts a good loading stroke', () => {
    expect(firstProblem(previewCsv(stand), 1, 2)).toBeNull()
  })
})

describe('previewCurve', () => {
  it('converts inches and pound-force with the exact factors (NIST SP 811, 2008, App. B.8)', () => {
    const file = ['in,lbf', '0,0', '0.5,1', '1,2', '1.5,3', '2,4'].join('\n')
    const observed = previewCurve(previewCsv(file), 0, 1, 'in', 'lbf')!
    // 1 in = 25.4 mm exactly; 1 lbf = 0.45359237 kg × 9.80665 m/s² = 4.4482216152605 N
    expect(observed.displacement[2]).toBeCloseTo(25.4, 12)
    expect(observed.force[1]).toBeCloseTo(4.4482216152605, 12)
  })
  it('converts gram-force: 1 gf = 9.80665 mN (standard gravity, NIST SP 811 App. B.8)', () => {
    const observed = previewCurve(previewCsv(['mm,gf', '0,0', '1,100', '2,200', '3,300', '4,400'].join('\n')), 0, 1, 'mm', 'gf')!
    expect(observed.force[1]).toBeCloseTo(0.980665, 12)
  })
  it('draws nothing while a cell would be refused', () => {
    expect(previewCurve(previewCsv(stand.replace('0.43', 'x')), 1, 2, 'mm', 'N')).toBeNull()
  })
})

describe('columnName and serverProblemLocation', () => {
  it('names a column by number and header', () => {
    expect(columnName({ header: ['Load (N)'] }, 0)).toBe('Column 1 (Load (N))')
    expect(columnName({ header: null }, 1)).toBe('Column 2')
  })
  it('reads the row and column of a refused upload from the error details', () => {
    expect(serverProblemLocation({ row: 7, column: 2, issues: [] })).toEqual({ row: 7, column: 2 })
    expect(serverProblemLocation({ row: null, column: 'x' })).toEqual({ row: null, column: null })
    expect(serverProblemLocation(null)).toEqual({ row: null, column: null })
  })
})
