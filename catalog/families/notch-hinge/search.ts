/** Search's fast estimate of the notch hinge: the Paros–Weisbord compliance on raw numbers (a test holds it to the family's evaluate). */
import { bendingModulus } from '../../mechanics/wide-beam'
import { dedicatedEstimator, layoutOf } from '../../schema/estimator'
import { neckStrain, parosWeisbordCompliance, rotationRange } from './model'

const DEG = 180 / Math.PI

export const estimator = dedicatedEstimator('paros-weisbord', 'paros-weisbord', true,
  layoutOf([['rotationalStiffness', 1], ['maxRotation', 0], ['maxStrain', 0], ['safetyFactor', 0]]),
  (p, material, limit, out, bending) => {
    const E = bendingModulus(material, bending, p.depth, p.neckThickness) // the model's wide-beam rule
    // compliance ∝ 1/E and the limit moment ∝ E: the rotation range and the strain do not depend on E
    const compliance = parosWeisbordCompliance(E, p.depth, p.radius, p.neckThickness)
    const range = rotationRange(compliance, E, p.depth, p.neckThickness, limit)
    const strain = neckStrain(range.maxRotation / compliance, E, p.depth, p.neckThickness)
    out[0] = 1 / compliance
    out[1] = range.maxRotation * DEG
    out[2] = strain
    out[3] = limit / strain
    return true
  },
  undefined,
  // stiffness ∝ depth, range and strain independent of it; the block's thickness does not enter the compliance
  ['depth', 'blockThickness'])
