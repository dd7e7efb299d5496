/** Fitted moduli grouped per printer and material: the calibration figures of an entry. */

export interface CalibrationSample {
  reportId: number
  printer: string
  material: string
  /** Fitted effective modulus, MPa. */
  modulus: number
}

export interface CalibrationGroup {
  printer: string
  material: string
  count: number
  moduli: Array<{ reportId: number; modulus: number }>
  /** Arithmetic mean, MPa. */
  mean: number
  /** Sample standard deviation (n − 1), MPa; null for a single report. */
  standardDeviation: number | null
  /** Largest minus smallest, MPa. */
  range: number
  min: number
  max: number
}

export function calibrationSummary(samples: readonly CalibrationSample[]): CalibrationGroup[] {
  const groups = new Map<string, CalibrationSample[]>()
  for (const s of samples) {
    const key = JSON.stringify([s.printer, s.material])
    groups.set(key, [...(groups.get(key) ?? []), s])
  }
  const out: CalibrationGroup[] = []
  for (const list of groups.values()) {
    const moduli = list.map((s) => s.modulus)
    const n = moduli.length
    const mean = moduli.reduce((a, b) => a + b, 0) / n
    const sd = n > 1 ? Math.sqrt(moduli.reduce((a, m) => a + (m - mean) ** 2, 0) / (n - 1)) : null
    const min = Math.min(...moduli)
    const max = Math.max(...moduli)
    out.push({
      printer: list[0].printer, material: list[0].material, count: n,
      moduli: list.map((s) => ({ reportId: s.reportId, modulus: s.modulus })),
      mean, standardDeviation: sd, range: max - min, min, max,
    })
  }
  return out.sort((a, b) => a.printer.localeCompare(b.printer) || a.material.localeCompare(b.material))
}
