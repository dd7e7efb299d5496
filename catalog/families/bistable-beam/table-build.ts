/**
 * The normalised performance table of the bistable pair, computed with the nonlinear solver.
 * In slender-beam theory the shape of the curve depends only on dimensionless groups:
 *   Q = apexHeight/thickness, η = apexHeight/span (how deep the arch is), and the side posts.
 * Posts act twice: their end rotation (∝ p = postLength/span) and their sideways give, a
 * cantilever k = 3EI/L_p³ in series with the beam's EA/l, EA/(l·k) = 4p³(span/thickness)²
 * (docs/references.md §1, support compliance). The sideways give is what moves the snap and removes
 * bistability, so the post axis is w = p·(span/thickness)^(2/3) (EA/(l·k) = 4w³): in w the
 * places where the curve changes character (the peak's corner, the second position passing
 * the end of travel, the bistability limit) lie close together for every slenderness, where
 * in p they spread over a factor of 4 (measured: the limit at w ≈ 1.5–2.3 for span/t 50–200).
 * Forces scale with 2·E·I·h/l³ (two beams), energies with that times h, strain with t·h/l².
 */
import { solveBistableCurve, type BistableGeometry } from './fe-model'
import { snapMetrics, work } from './curve-metrics'
import { MAX_POST, MAX_RATIO, MAX_RISE, MIN_RATIO, MIN_SLENDERNESS, params } from './params'

/**
 * Normalised metrics of each node; `fold` is 1 where the path folds back past the peak (a
 * second snap, short side posts) and 0 elsewhere: interpolated, anything above 0 says a node
 * around the point folds, and the estimate is marked uncertain there.
 */
export const TABLE_METRICS = ['peak', 'valley', 'unstableAt', 'secondAt', 'workIn', 'barrier', 'strain', 'fold'] as const
export type TableMetric = (typeof TABLE_METRICS)[number]

export interface TableAxes {
  q: number[]
  eta: number[]
  /** w = (postLength/span)·(span/thickness)^(2/3). */
  w: number[]
}

/** Error statistics of one metric over a validation sample (fractions of the metric itself). */
export interface ErrorQuantiles { median: number; p90: number; p99: number; max: number }

/** Flips and errors in one region of the validation sample. */
export interface RegionValidation {
  /** Direct solves in the region, and those the estimate marks uncertain. */
  cases: number
  uncertain: number
  /** Cases where the table's bistable flag differed from the solver's, and those of them the estimate did not mark uncertain. */
  flips: number
  unmarkedFlips: number
  /** Over the region's bistable cases, |table − direct| / |direct| per metric (uncertain ones included). */
  errors: Record<string, ErrorQuantiles>
}

/** The table's interpolation error, measured by the generator on held-out direct solves. */
export interface TableValidation {
  /** Seed of the sample (a different stream from the tests'). */
  seed: number
  /** Direct solves in the uniform sample, those that are bistable by the solver, those the estimate marks uncertain. */
  cases: number
  bistableCases: number
  uncertainCases: number
  /**
   * Over the uniform sample's bistable cases the estimate does not mark uncertain:
   * |table − direct| / |direct| per estimate metric — each metric against itself (the barrier
   * against the barrier). Search allows a certain estimate this much; uncertain ones it judges exactly.
   */
  bistable: Record<string, ErrorQuantiles>
  /** Over all cases of the uniform sample (monostable ones too): peak and valley error as fractions of the peak. */
  all: Record<string, ErrorQuantiles>
  /** Flag flips over every case (uniform sample and dense regions), and those the estimate did not mark uncertain (search relies on this being 0). */
  flips: number
  unmarkedFlips: number
  /** Largest |valley|/peak (of the direct solve) among the flips: the band around the limit. */
  flagBand: number
  /** Dense samples where the table is weakest: near the bistability limit, and short side posts (where the path may fold). */
  regions: { nearLimit: RegionValidation; shortPost: RegionValidation }
  /**
   * Fingerprint of the table values the validation was measured on (see valuesFingerprint):
   * a test recomputes it, so a table regenerated without its validation fails.
   */
  fingerprint: number
  /** The first cases of the uniform sample with their direct and table valley/peak, re-solved by a test. */
  spotChecks: Array<{ case: { span: number; apexHeight: number; thickness: number; depth: number; postLength: number }; direct: number; table: number }>
}

/** A checksum of the table's values (weighted sum over finite values), to six figures. */
export function valuesFingerprint(values: Float64Array): number {
  let sum = 0
  for (let i = 0; i < values.length; i++) if (Number.isFinite(values[i])) sum += values[i] * (1 + (i % 97) / 97)
  return Number(sum.toPrecision(9))
}

/** The table as stored in table-data.json (lists per metric, null where not computed or the solve failed). */
export interface BistableTableFile {
  format: string
  formatVersion: number
  solverVersion: number
  modelVersion: number
  axes: TableAxes
  /** One list per metric, index = (iq·|eta| + ie)·|w| + iw. */
  values: Record<TableMetric, Array<number | null>>
  validation: TableValidation
}

/** The estimate metrics whose error the validation states, each as a fraction of itself. */
export const ERROR_METRICS = ['peakForce', 'valleyForce', 'unstablePosition', 'secondStablePosition', 'energyIn', 'energyBarrier', 'maxStrain'] as const

export function defaultAxes(): TableAxes {
  const q = Array.from({ length: 28 }, (_, i) => 1.5 + 0.5 * i)
  const eta = Array.from({ length: 16 }, (_, i) => 0.002 * 100 ** (i / 15))
  // dense up to w = 3, where the curve changes character; geometric beyond, where it changes slowly
  const near = Array.from({ length: 46 }, (_, i) => 3 * (i / 45) ** 1.5)
  const far = Array.from({ length: 12 }, (_, i) => 3 * 1.24 ** (i + 1))
  return { q, eta, w: [...near, ...far] }
}

const range = (key: string) => params.find((p) => p.key === key)!

/**
 * Whether some valid parameter set has these groups: the family's ranges and cross-field rules
 * (params.ts) in dimensionless form. With span l, apexHeight h = ηl, thickness t = h/Q and
 * postLength pl, a span must exist inside every bound at once.
 */
function groupsFeasible(q: number, eta: number, w: number): boolean {
  const eps = 1e-9
  if (q < MIN_RATIO - eps || q > MAX_RATIO + eps || eta > MAX_RISE + eps || w < 0) return false
  const slenderness = q / eta
  if (slenderness < MIN_SLENDERNESS - eps) return false
  const p = w / slenderness ** (2 / 3)
  if (p > MAX_POST + eps) return false
  const span = range('span'), apex = range('apexHeight'), thick = range('thickness'), post = range('postLength')
  // bounds on the span from each parameter's range
  const lo = Math.max(span.min, apex.min / eta, (thick.min * q) / eta)
  const hi = Math.min(span.max, apex.max / eta, (thick.max * q) / eta, p > 0 ? post.max / p : Infinity)
  return lo <= hi * (1 + eps)
}

/** The geometry of a table node, for a reference span of 100 mm and E = 1000 MPa. */
function nodeGeometry(q: number, eta: number, w: number): BistableGeometry {
  const span = 100
  const apexHeight = eta * span
  const thickness = apexHeight / q
  return { span, apexHeight, thickness, depth: 1, postLength: (w / (q / eta) ** (2 / 3)) * span, modulus: 1000 }
}

/**
 * Normalised metrics of one node (NaN where the solver could not follow the path). The energy
 * barrier is extended continuously past the end of travel (work from the unstable position to
 * the end when the second position lies beyond it), so that it interpolates without a jump;
 * the estimate reports it only where the second position is reached.
 */
export function nodeMetrics(q: number, eta: number, w: number): Record<TableMetric, number> {
  const g = nodeGeometry(q, eta, w)
  const scale = (2 * g.modulus * ((g.depth * g.thickness ** 3) / 12) * g.apexHeight) / g.span ** 3
  const h = g.apexHeight
  try {
    const fe = solveBistableCurve(g)
    const x = fe.displacement, f = fe.force
    const m = snapMetrics(x, f)
    const barrier = m.bistable ? m.energyBarrier : m.valleyForce < 0 ? -work(x, f, m.unstableAt, x[x.length - 1]) : 0
    return {
      peak: m.peakForce / scale, valley: m.valleyForce / scale,
      unstableAt: m.unstableAt / h, secondAt: m.secondAt / h,
      workIn: m.energyIn / (scale * h), barrier: barrier / (scale * h),
      strain: Math.max(...fe.strain) / ((g.thickness * h) / g.span ** 2),
      fold: fe.folds.some((at) => at > m.peakAt) ? 1 : 0,
    }
  } catch {
    return Object.fromEntries(TABLE_METRICS.map((k) => [k, NaN])) as Record<TableMetric, number>
  }
}

/**
 * Whether a node is needed: some valid parameter set lies in a cell whose interpolation uses it
 * (cubic along Q and η reaches two nodes each way, linear along w one). Checked on a sample of
 * points spread over those cells; nodes far outside the valid groups are not solved.
 */
export function nodeNeeded(axes: TableAxes, iq: number, ie: number, iw: number): boolean {
  const span = (a: number[], i: number, reach: number): [number, number] => [a[Math.max(0, i - reach)], a[Math.min(a.length - 1, i + reach)]]
  const [q0, q1] = span(axes.q, iq, 2), [e0, e1] = span(axes.eta, ie, 2), [w0, w1] = span(axes.w, iw, 1)
  // 8 points a cell along Q and η, 4 along w
  const n = 8, nw = 8
  for (let a = 0; a <= n; a++) for (let b = 0; b <= n; b++) for (let c = 0; c <= nw; c++) {
    const q = q0 + ((q1 - q0) * a) / n, eta = e0 * (e1 / e0) ** (b / n), w = w0 + ((w1 - w0) * c) / nw
    if (groupsFeasible(q, eta, w)) return true
  }
  return false
}
