/** Search's fast estimate of the parallel guide: its linear closed forms on raw numbers (a test holds it to the family's evaluate). */
import { bendingModulus } from '../../mechanics/wide-beam'
import { dedicatedEstimator, layoutOf } from '../../schema/estimator'
import { linearStiffness, linearStrain, linearTravelRange, parasiticShortening } from './model'

export const estimator = dedicatedEstimator('linear', 'linear', true,
  layoutOf([['stiffness', 1], ['maxTravel', 0], ['parasiticMotion', 0], ['maxStrain', 0], ['safetyFactor', 0]]),
  (p, material, limit, out, bending) => {
    const E = bendingModulus(material, bending, p.depth, p.thickness) // the model's wide-beam rule
    const range = linearTravelRange(p, limit)
    const strain = linearStrain(p, range.maxTravel)
    out[0] = linearStiffness(p, E)
    out[1] = range.maxTravel
    out[2] = parasiticShortening(p.length, range.maxTravel)
    out[3] = strain
    out[4] = limit / strain
    return true
  },
  undefined,
  // stiffness ∝ depth, the rest independent of it; a wider spacing lowers the axial part of the strain, so the travel grows with it
  ['depth', 'spacing'])
