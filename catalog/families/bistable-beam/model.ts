import { bendingBasis } from '../../mechanics/wide-beam'
import { ValidationError } from '../../errors'
import type { AxisSpec, MethodInfo, MetricSpec, MetricValue, ModelInput, ModelOutput } from '../../schema/types'
import { nonlinearFeMethod, peakStrainMetric, strainLimitMetric, strainSafetyMetric } from '../../schema/define'
import { closedFormForce, closedFormMetrics, closedFormStrain, CRITICAL_Q } from './closed-form'
import { reportedMetrics, snapMetrics, type SnapMetrics } from './curve-metrics'
import { FE_POINTS, solveBistableCurve, solveBistableFe } from './fe-model'
import { MIN_SLENDERNESS } from './params'

export const methods: MethodInfo[] = [
  nonlinearFeMethod('Corotational Euler–Bernoulli beam elements (Crisfield 1991; shallow-arch local strain, Battini & Pacoste 2002), displacement-controlled Newton–Raphson path following with the second symmetric shape seeded at the bifurcation (Qiu, Lang & Slocum 2004); mesh error removed by Richardson extrapolation from two meshes (Richardson 1911).'),
  {
    id: 'closed-form', label: 'Two-mode closed form',
    source: 'Qiu, Lang & Slocum, "A curved-beam bistable mechanism", J. Microelectromechanical Systems 13(2):137–146, 2004 (rigidly clamped ends only).',
  },
]

export const axes: { displacement: AxisSpec; force: AxisSpec } = {
  displacement: { label: 'Shuttle displacement', unit: 'mm' },
  force: { label: 'Force', unit: 'N' },
}

export const metrics: MetricSpec[] = [
  { key: 'peakForce', label: 'Peak force', unit: 'N', help: 'First local maximum of the force on the way in: what it takes to snap the switch over. Later in the travel the force can climb past it (a part that springs back); that is the largest force.' },
  { key: 'largestForce', label: 'Largest force', unit: 'N', help: 'Largest force anywhere over the travel, to twice the apex height: what the shuttle and its stop must carry. Equals the peak force unless the force climbs past the peak later.' },
  { key: 'valleyForce', label: 'Valley force', unit: 'N', help: 'Smallest force after the peak; negative means the shuttle pulls itself into the second position.' },
  { key: 'unstablePosition', label: 'Unstable position', unit: 'mm', help: 'Where the force falls through zero between peak and valley (empty when the part springs back).' },
  { key: 'secondStablePosition', label: 'Second stable position', unit: 'mm', help: 'Where the force rises back through zero: the shuttle rests here (empty when it springs back).' },
  { key: 'secondSnapPosition', label: 'Second snap', unit: 'mm', help: 'Where the shuttle, pushed to a set position, jumps a second time because the path folds back (short side posts): a second click. Empty when the path does not fold.' },
  { key: 'energyIn', label: 'Work to snap', unit: 'mJ', help: 'Work done pushing the shuttle to the unstable position.' },
  { key: 'energyBarrier', label: 'Energy barrier', unit: 'mJ', help: 'Work to push the shuttle back from the second position over the unstable one.' },
  { key: 'bistable', label: 'Bistable', unit: 'boolean', help: 'True when the shuttle stays in a second position by itself.' },
  peakStrainMetric('Largest bending-plus-axial strain along the travel (0.02 = 2 %).', 'Largest strain'),
  strainLimitMetric(),
  strainSafetyMetric('travel', 'Strain limit divided by the largest strain.'),
]

/** Module force scale 2·E·I·h/l³ (two beams), N: the closed form's f is per beam. */
export function forceScale(p: Record<string, number>, modulus: number): number {
  const inertia = (p.depth * p.thickness ** 3) / 12
  return (2 * modulus * inertia * p.apexHeight) / p.span ** 3
}

/**
 * The closed form's error against nonlinear-fe (rigid ends), by the arch's rise h/l, the group
 * it depends on most: measured on a grid of span/thickness 25–150 and apexHeight/thickness
 * 2.5–15 (tests/catalog/bistable-beam/closed-form.test.ts repeats the measurement). Peak: how
 * much too high, %; valley: how much too deep, % of the peak.
 */
export const CLOSED_FORM_REGIMES = [
  { upTo: 0.035, label: 'up to 3.5 %', peak: [1, 4], valley: 1 },
  { upTo: 0.07, label: '3.5–7 %', peak: [3, 6], valley: 3 },
  { upTo: 0.1, label: '7–10 %', peak: [5, 10], valley: 5 },
  { upTo: Infinity, label: 'above 10 %', peak: [10, 31], valley: 15 },
] as const

export function closedFormRegime(rise: number): (typeof CLOSED_FORM_REGIMES)[number] {
  return CLOSED_FORM_REGIMES.find((r) => rise <= r.upTo + 1e-12)!
}

/** Near the critical ratio a tolerance on the printed thickness can remove bistability (common practice). */
const NEAR_CRITICAL = 0.15
/** Slender enough for Euler–Bernoulli beams to within a few percent (common practice). */
const SLENDER = 40

function closedForm(p: Record<string, number>, modulus: number): { x: number[]; f: number[]; strain: number[]; m: SnapMetrics } {
  const q = p.apexHeight / p.thickness
  const scale = forceScale(p, modulus)
  const x: number[] = [], f: number[] = [], strain: number[] = []
  const cf = closedFormMetrics(q)
  const stations = Array.from({ length: FE_POINTS }, (_, i) => (2 * i) / (FE_POINTS - 1))
  // the kinks of the path (where it meets and leaves the mode-3 line) are points of the curve
  const all = [...stations, cf.peakAt, cf.valleyAt].filter((d, i, a) => d >= 0 && d <= 2 && a.indexOf(d) === i).sort((a, b) => a - b)
  for (const d of all) {
    x.push(d * p.apexHeight)
    f.push(closedFormForce(q, d) * scale)
    strain.push(closedFormStrain(q, d, p.apexHeight, p.thickness, p.span))
  }
  const bistable = cf.secondAt !== null
  const m: SnapMetrics = {
    peakForce: cf.peak * scale, peakAt: cf.peakAt * p.apexHeight,
    valleyForce: cf.valley * scale, valleyAt: cf.valleyAt * p.apexHeight,
    unstableAt: (cf.unstableAt ?? cf.valleyAt) * p.apexHeight,
    secondAt: (cf.secondAt ?? cf.valleyAt) * p.apexHeight,
    energyIn: (cf.workIn ?? closedFormWorkToValley(q, cf.valleyAt)) * scale * p.apexHeight,
    energyBarrier: (cf.barrier ?? 0) * scale * p.apexHeight,
    bistable,
  }
  return { x, f, strain, m }
}

function closedFormWorkToValley(q: number, valleyAt: number): number {
  // trapezoid on a fine grid: only used for monostable curves, where energyIn is not reported
  let w = 0
  const n = 200
  for (let i = 1; i <= n; i++) w += 0.5 * (closedFormForce(q, ((i - 1) * valleyAt) / n) + closedFormForce(q, (i * valleyAt) / n)) * (valleyAt / n)
  return w
}

export function evaluate(input: ModelInput): ModelOutput {
  const { params: p, material, method } = input
  // the beams bend as plate strips when deep for their thickness (catalog/mechanics/wide-beam.ts)
  const bending = bendingBasis(material.modulus, { poissonRatio: material.poissonRatio, wideBeam: input.wideBeam }, p.depth, p.thickness, 'beams')
  const E = bending.modulus
  if (method === 'closed-form' && p.postLength > 0) {
    // compliant posts let the beam ends move and can remove bistability altogether; a rigid-end
    // estimate would be quietly wrong, so it is refused rather than returned with a warning
    throw new ValidationError([{ field: 'method', message: 'closed-form assumes rigidly clamped beam ends (postLength 0); use nonlinear-fe for side posts' }])
  }
  let x: number[], f: number[], strain: number[], m: SnapMetrics
  let folds: number[] = []
  if (method === 'closed-form') {
    ({ x, f, strain, m } = closedForm(p, E))
  } else {
    const fe = solveBistableCurve({ span: p.span, apexHeight: p.apexHeight, thickness: p.thickness, depth: p.depth, postLength: p.postLength, modulus: E })
    x = fe.displacement
    f = fe.force
    strain = fe.strain
    m = snapMetrics(x, f)
    // a fold before the peak cannot happen on this path; only those past it are a second snap
    folds = fe.folds.filter((at) => at > m.peakAt)
  }
  const maxStrain = Math.max(...strain)
  const reported = reportedMetrics(m, maxStrain, material.strainLimit)
  const secondSnap = folds.length ? folds[0] : null
  // keys in the order of `metrics`
  const out: Record<string, MetricValue> = {}
  // the largest force is read off the curve itself, not the snap metrics: it need not be the first peak
  const computed: Record<string, MetricValue> = { secondSnapPosition: secondSnap, largestForce: Math.max(...f) }
  for (const spec of metrics) out[spec.key] = spec.key in computed ? computed[spec.key] : reported[spec.key]
  const warnings = warningsFor(p, m, maxStrain, material.strainLimit, E, method)
  if (secondSnap !== null) {
    warnings.push(`Second snap: the force–displacement path folds back at ${Number(secondSnap.toPrecision(3))} mm (${Number((secondSnap / p.apexHeight).toFixed(2))} × the apex height); pushed to a set position the shuttle jumps there, a second click the user will feel. The curve shows the jump; the side posts cause it, and a slightly different post length or print can move or remove it.`)
  }
  return { curve: { displacement: x, force: f, strain, axes }, metrics: out, warnings, bending }
}

function pct(v: number): string {
  return `${Number((v * 100).toPrecision(3))} %`
}

function warningsFor(p: Record<string, number>, m: SnapMetrics, maxStrain: number, strainLimit: number, modulus: number, method: string): string[] {
  const w: string[] = []
  const q = p.apexHeight / p.thickness
  if (maxStrain > strainLimit) {
    w.push(`Largest strain ${pct(maxStrain)} exceeds the material's limit ${pct(strainLimit)}: the beams may crack or take a set; lower the apex height or the thickness, or lengthen the span.`)
  }
  if (m.valleyForce >= 0) {
    w.push(p.postLength > 0
      ? 'Not bistable: the shuttle springs back when released. The side posts give way under the beams\u2019 end thrust; shorten them or raise the apex height.'
      : `Not bistable: the shuttle springs back when released (apexHeight/thickness = ${q.toFixed(2)}; the pair needs more than ${CRITICAL_Q.toFixed(2)}, Qiu et al. 2004).`)
  } else {
    if (-m.valleyForce < NEAR_CRITICAL * m.peakForce) {
      w.push(`Barely bistable: the valley force is only ${pct(-m.valleyForce / m.peakForce)} of the peak; a slightly thinner print or a softer material can make it spring back.`)
    }
    if (!m.bistable) {
      w.push('The second stable position lies beyond twice the apex height (the posts let the beams travel further); a stop in the frame will set where the shuttle rests, and the energy barrier is not reported.')
    }
  }
  if (p.span / p.thickness < SLENDER) {
    w.push(`Thick beams (span/thickness = ${(p.span / p.thickness).toFixed(0)}, below ${SLENDER}): slender-beam theory neglects shear and may misjudge the force by a few percent${p.span / p.thickness < MIN_SLENDERNESS * 1.25 ? ' or more' : ''}.`)
  }
  if (method === 'closed-form') {
    if (p.apexHeight / p.span > 0.1) w.push('Deep arch (apex height above 10 % of the span): the shallow-arch closed form loses accuracy; check with nonlinear-fe.')
    const r = closedFormRegime(p.apexHeight / p.span)
    w.push(`The two-mode closed form places the peak early and overstates it: measured against nonlinear-fe for rigid ends with apex height ${r.label} of the span, the peak is ${r.peak[0]}–${r.peak[1]} % high and the valley up to ${r.valley} % of the peak too deep. Check the part with nonlinear-fe before relying on it.`)
  }
  if (p.postLength > 0 && method !== 'closed-form') {
    const rigid = rigidPeak(p, modulus)
    if (rigid > 0) {
      w.push(`Compliant side posts: the peak force is ${pct(m.peakForce / rigid)} of what rigidly clamped ends would give; post stiffness varies strongly with printed thickness.`)
    }
  }
  return w
}

/**
 * Peak force the same beams would give with rigidly clamped ends: one direct solve on the
 * fine mesh (within 1 % of the extrapolated peak away from the bistability limit), enough for
 * a ratio stated to three figures.
 */
function rigidPeak(p: Record<string, number>, modulus: number): number {
  try {
    const fe = solveBistableFe({ span: p.span, apexHeight: p.apexHeight, thickness: p.thickness, depth: p.depth, postLength: 0, modulus })
    return snapMetrics(fe.displacement, fe.force).peakForce
  } catch {
    return NaN
  }
}
