/**
 * Trilinear interpolation in the normalised table (see table-build.ts for its groups); no
 * allocation per call beyond the returned object, so search can scan millions of candidates.
 */
import { TABLE } from './table-data'
import { TABLE_METRICS, type BistableTable, type TableMetric } from './table-build'

/** The dimensionless groups of a parameter set. */
export function tableCoordinates(span: number, apexHeight: number, thickness: number, postLength: number): { q: number; eta: number; u: number } {
  const r = span / thickness
  const p = postLength / span
  return { q: apexHeight / thickness, eta: apexHeight / span, u: Math.log10(1 + 4 * p * p * p * r * r) }
}

function locate(axis: number[], v: number): [number, number] | null {
  const n = axis.length
  if (!(v >= axis[0] - 1e-12 && v <= axis[n - 1] + 1e-12)) return null
  let i = 0
  // axes are short: a linear scan beats bisection here
  while (i < n - 2 && v > axis[i + 1]) i++
  const w = (v - axis[i]) / (axis[i + 1] - axis[i])
  return [i, Math.min(1, Math.max(0, w))]
}

const weights = new Float64Array(8)
const corners = new Int32Array(8)

/**
 * Fills `out` (one slot per TABLE_METRICS entry) with interpolated normalised metrics;
 * returns false outside the table or where a surrounding node failed.
 */
export function interpolateTable(q: number, eta: number, u: number, out: Float64Array, table: BistableTable = TABLE): boolean {
  const a = table.axes
  const lq = locate(a.q, q), le = locate(a.eta, eta), lu = locate(a.u, u)
  if (!lq || !le || !lu) return false
  const ne = a.eta.length, nu = a.u.length
  let k = 0
  for (let dq = 0; dq < 2; dq++) for (let de = 0; de < 2; de++) for (let du = 0; du < 2; du++) {
    corners[k] = ((lq[0] + dq) * ne + le[0] + de) * nu + lu[0] + du
    weights[k] = (dq ? lq[1] : 1 - lq[1]) * (de ? le[1] : 1 - le[1]) * (du ? lu[1] : 1 - lu[1])
    k++
  }
  for (let m = 0; m < TABLE_METRICS.length; m++) {
    const col = table.values[TABLE_METRICS[m] as TableMetric]
    let s = 0
    for (let c = 0; c < 8; c++) s += weights[c] * col[corners[c]]
    if (!Number.isFinite(s)) return false
    out[m] = s
  }
  return true
}
