/**
 * Plan areas of the families' outlines computed from the shapes' own formulas (rectangles,
 * trapezoids, πr², circular segments, t × arc length by quadrature), independently of the
 * JSCAD polygons and booleans, plus the bound on how far the faceted mesh may differ.
 */
import { BEAM_SEGMENTS, HOLE_SEGMENTS } from '../../../catalog/geometry/outline'
import * as bistable from '../../../catalog/families/bistable-beam/geometry'
import * as leaf from '../../../catalog/families/leaf-hinge/geometry'
import * as notch from '../../../catalog/families/notch-hinge/geometry'
import * as guide from '../../../catalog/families/parallel-guide/geometry'
import * as serpentine from '../../../catalog/families/serpentine-spring/geometry'
import * as snap from '../../../catalog/families/snap-hook/geometry'

export type Params = Record<string, number>

export interface AnalyticArea {
  /** Exact plan area of the outline (mm²). */
  area: number
  /**
   * Largest plan-area difference the faceting may cause (mm²): each n-gon standing for a
   * circle of radius r is short by πr² − (n/2) r² sin(2π/n); chords of a curve of curvature κ
   * over segments s cut κ s³/12 each (circular-segment area to leading order).
   */
  facetBound: number
}

const circle = (d: number) => Math.PI * (d / 2) ** 2
/** Area an n-gon inscribed in a circle of diameter d misses. */
const polygonDeficit = (d: number, n: number) => circle(d) - (n / 2) * (d / 2) ** 2 * Math.sin((2 * Math.PI) / n)

/** ∫ₐᵇ √(1 + w0′²) dx of the cosine centreline, composite Simpson with 4000 intervals. */
export function cosineArcLength(span: number, apexHeight: number, a: number, b: number): number {
  const n = 4000
  const k = (2 * Math.PI) / span
  const f = (x: number) => Math.hypot(1, (apexHeight / 2) * k * Math.sin(k * x))
  const hStep = (b - a) / n
  let sum = f(a) + f(b)
  for (let i = 1; i < n; i++) sum += f(a + i * hStep) * (i % 2 === 1 ? 4 : 2)
  return (sum * hStep) / 3
}

/** Shoelace area of a simple polygon (positive counter-clockwise). */
export function shoelace(points: [number, number][]): number {
  let s = 0
  for (let i = 0; i < points.length; i++) {
    const [x0, y0] = points[i]
    const [x1, y1] = points[(i + 1) % points.length]
    s += x0 * y1 - x1 * y0
  }
  return s / 2
}

function bistableBeamArea(p: Params): AnalyticArea {
  const { span, apexHeight: h, thickness: t, postLength: post } = p
  const L = bistable.layout(p)
  const W = bistable.FRAME_WALL
  const mid = span / 2
  let area = 2 * W * (L.wallTop - L.frameBottom) + (span - 2 * L.innerX) * (L.baseTop - L.frameBottom)
  // each beam: two free halves between the anchor (frame face or post face) and the shuttle;
  // a strip of constant normal width t has area t × arc length
  const beamStart = post > 0 ? t / 2 : 0
  area += 2 * 2 * t * cosineArcLength(span, h, beamStart, mid - L.shuttleWidth / 2)
  area += L.shuttleWidth * (L.padTop - L.shuttleBottom) + (L.padWidth - L.shuttleWidth) * (L.padTop - L.padBottom)
  if (post > 0) {
    const blockWidth = t / 2 - L.innerX
    if (-post > L.baseTop) area += 2 * blockWidth * (-post - L.baseTop)
    area += 2 * blockWidth * bistable.LEDGE
    area += 4 * t * (post + t / 2)
  }
  for (const c of L.holes) area -= circle(c.diameter)
  // curvature of the offset curves: at most κ0/(1 − κ0 t/2), κ0 = (h/2)(2π/l)²
  const k0 = (h / 2) * ((2 * Math.PI) / span) ** 2
  const kappa = k0 / (1 - (k0 * t) / 2)
  const slopeMax = (h / 2) * ((2 * Math.PI) / span)
  const s = (span / BEAM_SEGMENTS) * Math.hypot(1, slopeMax)
  let facetBound = 2 * 2 * BEAM_SEGMENTS * (kappa * s ** 3) / 12
  // vertical cuts at the shuttle faces and post faces trade two small triangles that cancel to
  // first order; the rest is below t³κ per cut; a beam end entering a post top (y = t/2) leaves
  // at most (t/2)·w0(t) of beam above it
  facetBound += 8 * t ** 3 * kappa + (post > 0 ? 4 * (t / 2) * (h / 2) * (1 - Math.cos((2 * Math.PI * t) / span)) : 0)
  for (const c of L.holes) facetBound += polygonDeficit(c.diameter, HOLE_SEGMENTS)
  return { area, facetBound }
}

function leafHingeArea(p: Params): AnalyticArea {
  const { fixedLength, hole } = leaf.layout(p)
  const area = (fixedLength + p.linkLength) * leaf.LINK_HEIGHT + p.thickness * p.length - circle(hole.diameter)
  return { area, facetBound: polygonDeficit(hole.diameter, HOLE_SEGMENTS) }
}

/** Area of a circle of radius R lying below a chord at signed height δ above its centre. */
function circleBelowChord(R: number, delta: number): number {
  if (delta <= -R) return 0
  if (delta >= R) return Math.PI * R * R
  return R * R * Math.acos(-delta / R) + delta * Math.sqrt(R * R - delta * delta)
}

function notchHingeArea(p: Params): AnalyticArea {
  const { radius: R, neckThickness: t, blockThickness: h } = p
  const L = notch.layout(p)
  // signed distance from a cut-out centre (at R + t/2) to the block surface (at h/2)
  const delta = h / 2 - (R + t / 2)
  const cut = delta > 0 ? (Math.PI * R * R) / 2 + 2 * R * delta : circleBelowChord(R, delta)
  let area = 2 * L.halfLength * h - 2 * cut
  let facetBound = 2 * polygonDeficit(2 * R, notch.NOTCH_SEGMENTS)
  for (const c of L.holes) {
    area -= circle(c.diameter)
    facetBound += polygonDeficit(c.diameter, HOLE_SEGMENTS)
  }
  return { area, facetBound }
}

function parallelGuideArea(p: Params): AnalyticArea {
  const L = guide.layout(p)
  let area = (guide.BASE_LENGTH + guide.STAGE_LENGTH) * (p.spacing + 2 * guide.GUIDE_MARGIN) + 2 * p.thickness * p.length
  let facetBound = 0
  for (const c of L.holes) {
    area -= circle(c.diameter)
    facetBound += polygonDeficit(c.diameter, HOLE_SEGMENTS)
  }
  return { area, facetBound }
}

function serpentineSpringArea(p: Params): AnalyticArea {
  const { spans: n, spanLength: b, pitch: a, thickness: t } = p
  const L = serpentine.layout(p)
  // spans include their square outer corners; connectors show a − t between spans; each pad
  // takes t × t/2 of the span end it holds
  let area = n * t * (b + t) + (n - 1) * t * (a - t) + 2 * serpentine.PAD_SIZE ** 2 - 2 * (t * t) / 2
  let facetBound = 0
  for (const c of L.holes) {
    area -= circle(c.diameter)
    facetBound += polygonDeficit(c.diameter, HOLE_SEGMENTS)
  }
  return { area, facetBound }
}

function snapHookArea(p: Params): AnalyticArea {
  const { length: l, rootThickness: h0, tipThickness: h1 } = p
  const L = snap.layout(p)
  const base = snap.BASE_LENGTH * (h0 + 2 * snap.BASE_MARGIN)
  const arm = (l * (h0 + h1)) / 2
  // the head's foot overlaps the arm below its front face, a trapezoid from the retaining foot to the tip
  const headOnArm = ((l - L.retainFoot) * (L.front(L.retainFoot) + h1)) / 2
  const area = base + arm + shoelace(L.head) - headOnArm - circle(L.hole.diameter)
  return { area, facetBound: polygonDeficit(L.hole.diameter, HOLE_SEGMENTS) }
}

export const analyticArea: Record<string, (p: Params) => AnalyticArea> = {
  'bistable-beam': bistableBeamArea,
  'leaf-hinge': leafHingeArea,
  'notch-hinge': notchHingeArea,
  'parallel-guide': parallelGuideArea,
  'serpentine-spring': serpentineSpringArea,
  'snap-hook': snapHookArea,
}
