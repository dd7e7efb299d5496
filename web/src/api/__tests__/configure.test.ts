import { describe, expect, it } from 'vitest'
import { configurationQuery, fileNameFromDisposition } from '../configure'

describe('download file names from Content-Disposition', () => {
  it('keeps the server name of a quoted filename', () => {
    const header = 'attachment; filename="power-switch-field-node-shell-s1-bistable-beam-span60-ah2.1-t0.7-depth6-pl0.stl"'
    expect(fileNameFromDisposition(header, 'part.stl')).toBe('power-switch-field-node-shell-s1-bistable-beam-span60-ah2.1-t0.7-depth6-pl0.stl')
  })

  it('prefers filename* (RFC 6266) and decodes it', () => {
    expect(fileNameFromDisposition(`attachment; filename="a.csv"; filename*=UTF-8''clip%20latch-curve.csv`, 'x.csv')).toBe('clip latch-curve.csv')
  })

  it('reads an unquoted filename', () => {
    expect(fileNameFromDisposition('attachment; filename=hook.stl', 'x.stl')).toBe('hook.stl')
  })

  it('drops folders and control characters, and falls back when nothing usable is left', () => {
    expect(fileNameFromDisposition('attachment; filename="../../etc/passwd"', 'x.stl')).toBe('passwd')
    expect(fileNameFromDisposition('attachment; filename="a\u0007b.stl"', 'x.stl')).toBe('ab.stl')
    expect(fileNameFromDisposition('attachment; filename=".."', 'x.stl')).toBe('x.stl')
    expect(fileNameFromDisposition(null, 'fallback.pdf')).toBe('fallback.pdf')
    expect(fileNameFromDisposition('inline', 'fallback.pdf')).toBe('fallback.pdf')
  })
})

describe('download query', () => {
  it('URL-encodes the JSON fields and sends the method as text', () => {
    const q = new URLSearchParams(configurationQuery({
      params: { thickness: 0.8, material: 'petg' },
      method: 'closed-form',
      window: { kind: 'bistable', peakForce: { min: 3 } },
      tolerance: { thickness: 0.05, modulus: 0.1 },
      printer: null,
    }))
    expect(JSON.parse(q.get('params')!)).toEqual({ thickness: 0.8, material: 'petg' })
    expect(JSON.parse(q.get('window')!)).toEqual({ kind: 'bistable', peakForce: { min: 3 } })
    expect(q.get('method')).toBe('closed-form')
    expect(q.has('printer')).toBe(false)
  })
})
