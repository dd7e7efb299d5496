/**
 * A measured curve against the predicted curve of the revision it tested: the differences
 * in peak force, valley force and initial stiffness, and the fitted effective modulus.
 */
import { extentOf, interpolateAt } from './interpolate'
import { INITIAL_SLOPE_FRACTION, MIN_SLOPE_POINTS, initialSlope, peakOf, valleyOf } from './curve-features'
import { fitModulus, type ModulusFit } from './fit-modulus'
import type { SampledCurve } from './types'

export interface FeatureDifference {
  measured: number
  predicted: number
  /** measured − predicted */
  difference: number
  /** (measured − predicted) / |predicted|; null when the prediction is zero. */
  relative: number | null
}

export interface CurveComparison {
  peakForce: FeatureDifference | null
  /** Only for families with a valley (bistable modules); null when either curve has none. */
  valleyForce: FeatureDifference | null
  /** Initial slope in force unit per displacement unit, over the same travel for both. */
  stiffness: FeatureDifference | null
  /** Travel over which the initial slopes were fitted. */
  stiffnessOver: number
  modulusFit: ModulusFit | null
  /** Why there is no fit, when there is none. */
  modulusFitProblem: string | null
}

export interface CompareOptions {
  /** The modulus (MPa) behind the predicted curve. */
  predictedModulus: number
  /** Whether the family's curve has a valley after its peak. */
  hasValley: boolean
}

function differenceOf(measured: number | null | undefined, predicted: number | null | undefined): FeatureDifference | null {
  if (measured == null || predicted == null) return null
  return { measured, predicted, difference: measured - predicted, relative: predicted === 0 ? null : (measured - predicted) / Math.abs(predicted) }
}

/**
 * The predicted curve read at the measured displacements, so that both initial slopes are
 * fitted through the same abscissae (a curved start would otherwise give different
 * slopes for different sampling); the prediction's own samples when too few overlap.
 */
function predictedAtMeasured(measured: SampledCurve, predicted: SampledCurve): SampledCurve {
  const displacement: number[] = []
  const force: number[] = []
  for (const d of measured.displacement) {
    const f = interpolateAt(predicted.displacement, predicted.force, d)
    if (f === null) continue
    displacement.push(d)
    force.push(f)
  }
  return displacement.length >= MIN_SLOPE_POINTS ? { displacement, force } : predicted
}

export function compareToPrediction(measured: SampledCurve, predicted: SampledCurve, options: CompareOptions): CurveComparison {
  const [mLo, mHi] = extentOf(measured.displacement)
  const [pLo, pHi] = extentOf(predicted.displacement)
  // both slopes over the same travel: a tenth of the travel both curves cover
  const stiffnessOver = INITIAL_SLOPE_FRACTION * Math.max(0, Math.min(mHi, pHi) - Math.max(mLo, pLo))
  const { fit, reason } = fitModulus(measured, predicted, options.predictedModulus)
  return {
    peakForce: differenceOf(peakOf(measured)?.force, peakOf(predicted)?.force),
    valleyForce: options.hasValley ? differenceOf(valleyOf(measured)?.force, valleyOf(predicted)?.force) : null,
    stiffness: differenceOf(initialSlope(measured, stiffnessOver), initialSlope(predictedAtMeasured(measured, predicted), stiffnessOver)),
    stiffnessOver,
    modulusFit: fit,
    modulusFitProblem: reason,
  }
}
