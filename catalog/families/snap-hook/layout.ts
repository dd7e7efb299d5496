/**
 * Where the snap hook's features sit (head outline, retaining-face foot, hole), without JSCAD,
 * so the parameter rules and the web worker can use it without loading the geometry kernel.
 * See geometry.ts for the layout conventions.
 */
import type { Point } from '../../geometry/outline'

export const BASE_LENGTH = 8
export const BASE_MARGIN = 3
export const HEAD_LAND = 0.5
export const HOLE_DIAMETER = 3.2
/** The head may take at most this share of the arm, so the arm still bends as a cantilever. */
export const MAX_HEAD_SHARE = 0.5
const deg = Math.PI / 180

export interface SnapHookLayout {
  /** Arm front face height at x. */
  front: (x: number) => number
  /** Head outline, counter-clockwise, including its foot down to the back face (it overlaps the arm). */
  head: Point[]
  /** x where the retaining face meets the arm's front face. */
  retainFoot: number
  hole: { x: number; y: number; diameter: number }
}

export function layout(params: Record<string, number>): SnapHookLayout {
  const { length: l, rootThickness: h0, tipThickness: h1, undercut: u, entryAngle } = params
  const taper = (h0 - h1) / l
  const front = (x: number) => h1 + taper * (l - x)
  const top = h1 + u
  const entryTop = l - u / Math.tan(entryAngle * deg)
  const landEnd = entryTop - HEAD_LAND
  const retainFoot = retainFootOf(params)
  const head: Point[] = [
    [retainFoot, 0],
    [l, 0],
    [l, h1],
    [entryTop, top],
    [landEnd, top],
    [retainFoot, front(retainFoot)],
  ]
  return { front, head, retainFoot, hole: { x: -BASE_LENGTH / 2, y: h0 / 2, diameter: HOLE_DIAMETER } }
}

/**
 * x where the retaining face meets the arm's front face: it leaves the land at retainAngle and
 * meets the tapered front face, x·tanβ = landEnd·tanβ − (top − front(x)), solved for x (linear
 * in x). On its own, without the rest of the layout, as the parameter rule checks it for every
 * candidate a search judges.
 */
function retainFootOf(params: Record<string, number>): number {
  const { length: l, rootThickness: h0, tipThickness: h1, undercut: u, entryAngle, retainAngle } = params
  const taper = (h0 - h1) / l
  const landEnd = l - u / Math.tan(entryAngle * deg) - HEAD_LAND
  const tanRetain = Math.tan(retainAngle * deg)
  return retainAngle >= 90 ? landEnd : (landEnd * tanRetain - u + taper * l) / (tanRetain + taper)
}

/** Message when the head would take more than MAX_HEAD_SHARE of the arm (for a cross-field rule), else null. */
export function headFitProblem(params: Record<string, number>): string | null {
  const retainFoot = retainFootOf(params)
  const headLength = params.length - retainFoot
  if (headLength <= MAX_HEAD_SHARE * params.length) return null
  return `the hook head (${headLength.toPrecision(3)} mm from undercut, entryAngle and retainAngle) must take at most half the arm length (${(MAX_HEAD_SHARE * params.length).toPrecision(3)} mm): use a steeper entryAngle or retainAngle, a smaller undercut or a longer arm`
}
