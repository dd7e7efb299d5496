/** Search's fast estimate of the snap hook: the snap-fit equations on raw numbers (a test holds it to the family's evaluate). */
import { dedicatedEstimator, layoutOf, nanIfNull } from '../../schema/estimator'
import { deflectionForce, rootStrainAt, wedgeForce } from './model'

export const estimator = dedicatedEstimator('snap-fit-equations', 'snap-fit-equations', true,
  layoutOf([['deflectionForce', 1], ['matingForce', 1], ['separationForce', 1], ['rootStrain', 0], ['strainLimit', 0], ['safetyFactor', 0]]),
  (p, E, limit, out) => {
    // the root strain is taken at the undercut (a displacement), so it does not depend on E
    const ratio = p.tipThickness / p.rootThickness
    const P = deflectionForce(E, p.width, p.rootThickness, p.length, p.undercut, ratio)
    const strain = rootStrainAt(p.undercut, p.length, p.rootThickness, ratio)
    out[0] = P
    out[1] = nanIfNull(wedgeForce(P, p.friction, p.entryAngle))
    out[2] = nanIfNull(wedgeForce(P, p.friction, p.retainAngle))
    out[3] = strain
    out[4] = limit
    out[5] = limit / strain
    return true
  })
