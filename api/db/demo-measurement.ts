/**
 * Demo "measurements": curves generated from the model, never measured. The demo's test reports
 * need a curve over the prediction that looks like a test-stand recording, so it is made the way
 * a printed part would differ from the model, and the report's notes say exactly that:
 *
 * - the printed part's modulus is a fraction of the nominal one (`modulusRatio`). For a linear
 *   elastic material the force of a beam model at a given displacement is proportional to the
 *   modulus (every stiffness term carries E; the geometry, and so the snap positions, do not), so
 *   the predicted force times the ratio is the model's curve for that modulus;
 * - the curve is resampled at the stand's even steps (linear interpolation of the prediction);
 * - Gaussian noise of standard deviation `noiseFraction` × the largest |force| is added to each
 *   force reading, from a fixed seed, so every start gives the same demo.
 *
 * The fitted modulus of such a report comes out near ratio × nominal; that is the demo's point.
 */
import type { MeasuredCurve } from './models/test-report'

export interface SyntheticMeasurement {
  /** Printed modulus over nominal modulus. */
  modulusRatio: number
  /** Standard deviation of the force noise, as a fraction of the largest |force|. */
  noiseFraction: number
  /** Readings over the predicted travel. */
  points: number
  /** Seed of the noise (any 32-bit integer). */
  seed: number
}

/** mulberry32: a small, well-known 32-bit generator; good enough for plot noise, and repeatable. */
function generator(seed: number): () => number {
  let a = seed >>> 0
  return () => {
    a = (a + 0x6d2b79f5) >>> 0
    let t = a
    t = Math.imul(t ^ (t >>> 15), t | 1)
    t ^= t + Math.imul(t ^ (t >>> 7), t | 61)
    return ((t ^ (t >>> 14)) >>> 0) / 4294967296
  }
}

/** Standard normal draws by the Box–Muller transform. */
function normal(uniform: () => number): () => number {
  return () => {
    const u = Math.max(uniform(), Number.EPSILON)
    return Math.sqrt(-2 * Math.log(u)) * Math.cos(2 * Math.PI * uniform())
  }
}

/** The prediction read at x (linear between its samples; the displacements rise). */
function readAt(displacement: readonly number[], force: readonly number[], x: number): number {
  let i = 1
  while (i < displacement.length - 1 && displacement[i] < x) i++
  const x0 = displacement[i - 1], x1 = displacement[i]
  const t = x1 === x0 ? 0 : (x - x0) / (x1 - x0)
  return force[i - 1] + t * (force[i] - force[i - 1])
}

const round = (v: number, digits: number) => Number(v.toFixed(digits))

export function syntheticMeasurement(predicted: { displacement: readonly number[]; force: readonly number[] }, options: SyntheticMeasurement): MeasuredCurve {
  const { displacement, force } = predicted
  const from = displacement[0]
  const to = displacement[displacement.length - 1]
  const scale = Math.max(...force.map((f) => Math.abs(f)))
  const noise = normal(generator(options.seed))
  const out: MeasuredCurve = { displacement: [], force: [] }
  for (let k = 0; k < options.points; k++) {
    const x = from + ((to - from) * k) / (options.points - 1)
    const f = options.modulusRatio * readAt(displacement, force, x) + options.noiseFraction * scale * noise()
    // a stand's resolution: 1 µm and 1 mN (or 1 mN·mm, or a thousandth of a degree)
    out.displacement.push(round(x, 3))
    out.force.push(round(f, 3))
  }
  return out
}

/** The CSV a test stand would export for the curve (what the report's file download gives). */
export function measurementCsv(curve: MeasuredCurve, units: { displacement: string; force: string }): string {
  const rows = curve.displacement.map((x, i) => `${x},${curve.force[i]}`)
  return `displacement_${units.displacement},force_${units.force}\n${rows.join('\n')}\n`
}
