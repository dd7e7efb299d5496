/**
 * Trilinear interpolation in the normalised table (see table-build.ts for its groups); no
 * allocation per call beyond the returned object, so search can scan millions of candidates.
 */
import { TABLE } from './table-data'
import { TABLE_METRICS, type BistableTable, type TableMetric } from './table-build'

/** The dimensionless groups of a parameter set. */
export function tableCoordinates(span: number, apexHeight: number, thickness: number, postLength: number): { q: number; eta: number; p: number } {
  return { q: apexHeight / thickness, eta: apexHeight / span, p: postLength / span }
}

const cell = new Int32Array(3)
const frac = new Float64Array(3)

/** Finds the cell of v on axis k (binary search); false outside the axis. */
function locate(axis: number[], v: number, k: number): boolean {
  const n = axis.length
  if (!(v >= axis[0] - 1e-12 && v <= axis[n - 1] + 1e-12)) return false
  let lo = 0, hi = n - 1
  while (hi - lo > 1) {
    const mid = (lo + hi) >> 1
    if (v >= axis[mid]) lo = mid
    else hi = mid
  }
  const w = (v - axis[lo]) / (axis[lo + 1] - axis[lo])
  cell[k] = lo
  frac[k] = w < 0 ? 0 : w > 1 ? 1 : w
  return true
}

const weights = new Float64Array(8)
const corners = new Int32Array(8)

/**
 * Fills `out` (one slot per TABLE_METRICS entry) with interpolated normalised metrics;
 * returns false outside the table or where a surrounding node failed.
 */
export function interpolateTable(q: number, eta: number, p: number, out: Float64Array, table: BistableTable = TABLE): boolean {
  const a = table.axes
  if (!locate(a.q, q, 0) || !locate(a.eta, eta, 1) || !locate(a.p, p, 2)) return false
  const ne = a.eta.length, np = a.p.length
  let k = 0
  for (let dq = 0; dq < 2; dq++) for (let de = 0; de < 2; de++) for (let dp = 0; dp < 2; dp++) {
    corners[k] = ((cell[0] + dq) * ne + cell[1] + de) * np + cell[2] + dp
    weights[k] = (dq ? frac[0] : 1 - frac[0]) * (de ? frac[1] : 1 - frac[1]) * (dp ? frac[2] : 1 - frac[2])
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
