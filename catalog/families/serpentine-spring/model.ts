/**
 * Serpentine (meander) spring pulled along its axis, one pad fixed and the other guided.
 * Castigliano's theorem, bending only, uniform EI: with the moving end's rotation held, the
 * end moment makes ∫M ds = 0, so M = F(y − ȳ) and k = EI/∫(y − ȳ)² ds (REFERENCES §6; for N odd
 * k = 1/[N b³/(12EI) + (N−1) a b²/(4EI)]; published forms: Fedder, PhD thesis, UC Berkeley, 1994).
 */
import { bendingBasis } from '../../mechanics/wide-beam'
import type { AxisSpec, MethodInfo, MetricSpec, ModelInput, ModelOutput } from '../../schema/types'
import { nonlinearFeMethod, peakStrainMetric, strainSafetyMetric } from '../../schema/define'
import { followPath, indicesUpTo, meshPolyline, rectangleSection, sampleAt, strainLimitedStop, type Frame, type PathResult } from '../../solvers'

export const CURVE_POINTS = 41
/** The curve runs this far past the strain-limit travel, so the limit sits inside the plot. */
export const CURVE_EXTENT = 1.2
/** Elongation beyond this fraction of the total span length is outside the spring's working range (capped). */
export const TRAVEL_CAP_RATIO = 0.5
/** Elongation over total span length above which the spans turn enough to stiffen the spring noticeably. */
const LINEAR_RANGE_RATIO = 0.15
/** Beam elements per span and per connector; the force is within 0.2 % of a mesh twice as fine (tests). */
export const SPAN_ELEMENTS = 8
export const CONNECTOR_ELEMENTS = 2
const FE_POINTS = 61

export const methods: MethodInfo[] = [
  {
    id: 'castigliano',
    label: 'Castigliano meander formula',
    source: 'Castigliano\u2019s theorem on the meander, bending only (k = EI/∫(y − ȳ)² ds; for an odd number of spans k = 1/[N b³/(12EI) + (N−1) a b²/(4EI)]; cf. Fedder, PhD thesis, UC Berkeley, 1994)',
  },
  nonlinearFeMethod('Geometrically exact planar beam elements (corotational formulation) on the meander as a frame of spans and connectors, followed along the equilibrium path under displacement control'),
]

export const metrics: MetricSpec[] = [
  { key: 'stiffness', label: 'Stiffness', unit: 'N/mm', help: 'Force per mm of elongation for small elongation.' },
  { key: 'maxTravel', label: 'Largest elongation', unit: 'mm', help: 'Elongation at which the spring reaches the strain limit (or the end of the working range).' },
  peakStrainMetric('Largest strain in the spring at the largest elongation (a fraction).'),
  strainSafetyMetric('elongation'),
]

export const axes: { displacement: AxisSpec; force: AxisSpec } = {
  displacement: { label: 'Elongation', unit: 'mm' },
  force: { label: 'Force', unit: 'N' },
}

export interface MeanderMoments {
  /** ∫(y − ȳ)² ds over the centreline, mm³. */
  secondMoment: number
  /** Largest |y − ȳ|: the lever arm of the axial force at the worst section, mm. */
  lever: number
  /** ȳ, the centroid of the centreline across the axis, mm. */
  centroid: number
}

/**
 * Moments of the meander centreline about the axis through its centroid. Span j runs across the
 * axis from y = 0 to y = b; connector j lies at y = b after an odd span and at y = 0 after an even one,
 * which covers an even number of spans (an unequal count of connectors on each side) as well as odd.
 */
export function meanderMoments(spans: number, spanLength: number, pitch: number): MeanderMoments {
  const b = spanLength
  const connectors = spans - 1
  const upper = Math.ceil(connectors / 2)
  const lower = connectors - upper
  const total = spans * b + connectors * pitch
  const centroid = (spans * b * (b / 2) + upper * pitch * b) / total
  // ∫₀ᵇ (y − c)² dy = ((b − c)³ + c³)/3
  const spanPart = (spans * ((b - centroid) ** 3 + centroid ** 3)) / 3
  const connectorPart = pitch * (upper * (b - centroid) ** 2 + lower * centroid ** 2)
  return { secondMoment: spanPart + connectorPart, lever: Math.max(centroid, b - centroid), centroid }
}

/** Castigliano stiffness k = EI/∫(y − ȳ)² ds, N/mm. */
export function castiglianoStiffness(spans: number, spanLength: number, pitch: number, bendingStiffness: number): number {
  return bendingStiffness / meanderMoments(spans, spanLength, pitch).secondMoment
}

function sectionOf(params: Record<string, number>, modulus: number) {
  const area = params.depth * params.thickness
  const inertia = (params.depth * params.thickness ** 3) / 12
  return { area, inertia, EI: modulus * inertia, EA: modulus * area }
}

/** Peak strain at force F: bending F·lever·(t/2)/EI plus the axial F/EA carried by the connectors there. */
export function linearStrainAtForce(params: Record<string, number>, modulus: number, force: number): number {
  const { EI, EA } = sectionOf(params, modulus)
  const { lever } = meanderMoments(params.spans, params.spanLength, params.pitch)
  return force * ((lever * params.thickness) / (2 * EI) + 1 / EA)
}

export function travelCap(params: Record<string, number>): number {
  return TRAVEL_CAP_RATIO * params.spans * params.spanLength
}

export function capWarning(params: Record<string, number>): string {
  return `The strain limit is not reached within ${travelCap(params).toPrecision(3)} mm of elongation (half the total span length); the largest elongation is capped at the end of the spring's working range.`
}

function castigliano(params: Record<string, number>, modulus: number, strainLimit: number): ModelOutput {
  const { EI } = sectionOf(params, modulus)
  const k = castiglianoStiffness(params.spans, params.spanLength, params.pitch, EI)
  const strainPerMm = linearStrainAtForce(params, modulus, k)
  const atLimit = strainLimit / strainPerMm
  const cap = travelCap(params)
  const strainGoverned = atLimit <= cap
  const maxTravel = strainGoverned ? atLimit : cap
  const warnings: string[] = []
  if (!strainGoverned) warnings.push(capWarning(params))
  const totalSpan = params.spans * params.spanLength
  if (maxTravel > LINEAR_RANGE_RATIO * totalSpan) {
    warnings.push(`The largest elongation is ${Math.round((100 * maxTravel) / totalSpan)} % of the total span length: the spans turn enough that the spring stiffens and the linear formula understates the force; use nonlinear-fe for the curve at large elongation.`)
  }
  const end = maxTravel * (strainGoverned ? CURVE_EXTENT : 1)
  const displacement: number[] = []
  const force: number[] = []
  const strain: number[] = []
  for (let i = 0; i < CURVE_POINTS; i++) {
    const d = (end * i) / (CURVE_POINTS - 1)
    displacement.push(d)
    force.push(k * d)
    strain.push(strainPerMm * d)
  }
  const peakStrain = strainPerMm * maxTravel
  return {
    curve: { displacement, force, strain, axes },
    metrics: { stiffness: k, maxTravel, maxStrain: peakStrain, safetyFactor: strainLimit / peakStrain },
    warnings,
  }
}

/**
 * The meander centreline as one polyline of beam elements: span j at x = j·pitch from y = 0 to b
 * (odd j going up, even going down), connectors along x at alternate ends. Node 0 is clamped to the
 * fixed pad; the last node is the moving pad: rotation held, free across the axis, driven along it.
 */
export function meanderFrame(params: Record<string, number>, modulus: number, spanElements = SPAN_ELEMENTS, connectorElements = CONNECTOR_ELEMENTS): { frame: Frame; pad: number } {
  const { spans, spanLength: b, pitch: a } = params
  const points: Array<{ x: number; y: number }> = [{ x: 0, y: 0 }]
  for (let j = 0; j < spans; j++) {
    const x = j * a
    const up = j % 2 === 0
    for (let i = 1; i <= spanElements; i++) points.push({ x, y: up ? (b * i) / spanElements : b - (b * i) / spanElements })
    if (j + 1 < spans) {
      const y = up ? b : 0
      for (let i = 1; i <= connectorElements; i++) points.push({ x: x + (a * i) / connectorElements, y })
    }
  }
  const part = meshPolyline(points, rectangleSection(modulus, params.thickness, params.depth))
  return {
    frame: { nodes: part.nodes, elements: part.elements, supports: [{ node: part.first, dofs: [0, 1, 2] }, { node: part.last, dofs: [2] }] },
    pad: part.last,
  }
}

export function solveMeander(params: Record<string, number>, modulus: number, travel: number, spanElements = SPAN_ELEMENTS, connectorElements = CONNECTOR_ELEMENTS): PathResult {
  const { frame, pad } = meanderFrame(params, modulus, spanElements, connectorElements)
  return followPath(frame, { control: { node: pad, dof: 0 }, target: travel, points: FE_POINTS, extrema: false })
}

function nonlinearFe(params: Record<string, number>, modulus: number, strainLimit: number): ModelOutput {
  const { EI } = sectionOf(params, modulus)
  const k = castiglianoStiffness(params.spans, params.spanLength, params.pitch, EI)
  const cap = travelCap(params)
  const estimate = strainLimit / linearStrainAtForce(params, modulus, k)
  const path = solveMeander(params, modulus, Math.min(estimate * CURVE_EXTENT * 1.25, cap))
  const travel = path.control
  const strains = path.maxStrain
  const stop = strainLimitedStop(path, strainLimit, cap, 'serpentine-spring')
  const warnings: string[] = stop.strainGoverned ? [] : [capWarning(params)]
  const at = (values: number[]) => sampleAt(values, stop.at)
  const maxTravel = at(travel)
  const keep = indicesUpTo(travel, maxTravel * (stop.strainGoverned ? CURVE_EXTENT : 1))
  const slope = (i: number) => path.reaction[i] / travel[i]
  const peakStrain = at(strains)
  return {
    curve: {
      displacement: keep.map((i) => travel[i]),
      force: keep.map((i) => path.reaction[i]),
      strain: keep.map((i) => strains[i]),
      axes,
    },
    metrics: {
      // Richardson on the first two points (F/δ = k0 + c₁δ + …) removes the first-order term of the small-travel slope.
      stiffness: 2 * slope(1) - slope(2),
      maxTravel,
      maxStrain: peakStrain,
      safetyFactor: strainLimit / peakStrain,
    },
    warnings,
  }
}

export function evaluate({ params, material, method, wideBeam }: ModelInput): ModelOutput {
  // the spans bend as plate strips when deep for their thickness (catalog/mechanics/wide-beam.ts)
  const bending = bendingBasis(material.modulus, { poissonRatio: material.poissonRatio, wideBeam }, params.depth, params.thickness, 'spans')
  const E = bending.modulus
  if (method === 'nonlinear-fe') return { ...nonlinearFe(params, E, material.strainLimit), bending }
  return { ...castigliano(params, E, material.strainLimit), bending }
}
