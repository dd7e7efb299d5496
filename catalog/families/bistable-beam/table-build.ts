/**
 * The normalised performance table of the bistable pair, computed with the nonlinear solver.
 * In slender-beam theory the shape of the curve depends only on dimensionless groups:
 *   Q = apexHeight/thickness, η = apexHeight/span (how deep the arch is), and the side-post
 *   length p = postLength/span. Posts act twice: their end rotation (∝ p) and their sideways
 *   give, a cantilever k = 3EI/L_p³ in series with the beam's EA/l, EA/(l·k) = 4p³(span/thickness)²
 *   (REFERENCES.md §1, support compliance) — so with span/thickness = Q/η the three groups
 *   fix the shape. p is spaced quadratically: short posts already change the curve a lot.
 * Forces scale with 2·E·I·h/l³ (two beams), energies with that times h, strain with t·h/l².
 */
import { solveBistableCurve, type BistableGeometry } from './fe-model'
import { snapMetrics } from './curve-metrics'

export const TABLE_METRICS = ['peak', 'valley', 'peakAt', 'valleyAt', 'unstableAt', 'secondAt', 'workIn', 'barrier', 'strain'] as const
export type TableMetric = (typeof TABLE_METRICS)[number]

export interface TableAxes {
  q: number[]
  eta: number[]
  /** p = postLength/span. */
  p: number[]
}

export interface BistableTable {
  solverVersion: number
  modelVersion: number
  axes: TableAxes
  /** One flat array per metric, index = (iq·|eta| + ie)·|p| + ip; NaN where the solve failed. */
  values: Record<TableMetric, number[]>
}

export function defaultAxes(): TableAxes {
  const q = Array.from({ length: 28 }, (_, i) => 1.5 + 0.5 * i)
  const eta = Array.from({ length: 16 }, (_, i) => 0.002 * 100 ** (i / 15))
  const p = Array.from({ length: 25 }, (_, i) => 0.5 * (i / 24) ** 2)
  return { q, eta, p }
}

/** The geometry of a table node, for a reference span of 100 mm and E = 1000 MPa. */
export function nodeGeometry(q: number, eta: number, p: number): BistableGeometry {
  const span = 100
  const apexHeight = eta * span
  const thickness = apexHeight / q
  return { span, apexHeight, thickness, depth: 1, postLength: p * span, modulus: 1000 }
}

/** Normalised metrics of one node (NaN where the solver could not follow the path). */
export function nodeMetrics(q: number, eta: number, p: number): Record<TableMetric, number> {
  const g = nodeGeometry(q, eta, p)
  const scale = (2 * g.modulus * ((g.depth * g.thickness ** 3) / 12) * g.apexHeight) / g.span ** 3
  const h = g.apexHeight
  try {
    const fe = solveBistableCurve(g)
    const m = snapMetrics(fe.displacement, fe.force)
    return {
      peak: m.peakForce / scale, valley: m.valleyForce / scale,
      peakAt: m.peakAt / h, valleyAt: m.valleyAt / h, unstableAt: m.unstableAt / h, secondAt: m.secondAt / h,
      workIn: m.energyIn / (scale * h), barrier: m.energyBarrier / (scale * h),
      strain: Math.max(...fe.strain) / ((g.thickness * h) / g.span ** 2),
    }
  } catch {
    return Object.fromEntries(TABLE_METRICS.map((k) => [k, NaN])) as Record<TableMetric, number>
  }
}
