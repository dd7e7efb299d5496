/** Search's fast estimate of the snap hook: the snap-fit equations on raw numbers (a test holds it to the family's evaluate). */
import { bendingModulus } from '../../mechanics/wide-beam'
import { dedicatedEstimator, layoutOf } from '../../schema/estimator'
import { taperIntegral } from './model'

const DEG = Math.PI / 180

/** wedgeForce (model.ts) on raw numbers, NaN where the face locks. */
function wedge(P: number, friction: number, angle: number): number {
  if (angle >= 90) return NaN
  const t = Math.tan(angle * DEG)
  const denominator = 1 - friction * t
  if (denominator <= 0) return NaN
  return (P * (friction + t)) / denominator
}

export const estimator = dedicatedEstimator('snap-fit-equations', 'snap-fit-equations', true,
  layoutOf([['deflectionForce', 1], ['matingForce', 1], ['separationForce', 1], ['rootStrain', 0], ['strainLimit', 0], ['safetyFactor', 0]]),
  (p, material, limit, out, bending) => {
    const E = bendingModulus(material, bending, p.width, p.rootThickness) // the model's wide-beam rule
    // the root strain is taken at the undercut (a displacement), so it does not depend on E
    // deflectionForce and rootStrainAt written out with the taper integral taken once (the same expressions, to the last bit but for the cubes below)
    const J = taperIntegral(p.tipThickness / p.rootThickness)
    // cubes as products, not ** 3: the power costs several times as much here and differs only in the last bit
    const P = (E * ((p.width * (p.rootThickness * p.rootThickness * p.rootThickness)) / 12) * p.undercut) / (J * (p.length * p.length * p.length))
    const strain = (p.rootThickness * p.undercut) / (2 * J * p.length * p.length)
    out[0] = P
    out[1] = wedge(P, p.friction, p.entryAngle)
    out[2] = wedge(P, p.friction, p.retainAngle)
    out[3] = strain
    out[4] = limit
    out[5] = limit / strain
    return true
  },
  undefined,
  // forces ∝ width and undercut, strain ∝ undercut; the wedge forces grow with the face angle and the friction until the face locks (empty)
  ['width', 'undercut', 'entryAngle', 'retainAngle', 'friction'],
  // every metric rises with all five or ignores them, but the safety factor, which falls with the undercut alone; the envelope grows with width and undercut
  true)
