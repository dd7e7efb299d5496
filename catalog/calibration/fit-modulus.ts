/**
 * The effective modulus that best explains a measured curve.
 *
 * For the linear-elastic models on the shelf, material enters the force only through E: at
 * fixed geometry F(d; E) = (E / E0) · F(d; E0). The best scale s of the predicted curve in
 * the least-squares sense minimises Σ (F_meas,i − s·F_pred(d_i))²; setting the derivative to
 * zero gives s = Σ F_meas,i F_pred,i / Σ F_pred,i², the slope of a regression through the
 * origin (Montgomery, Peck & Vining, Introduction to Linear Regression Analysis, Wiley, the
 * section "Regression through the origin"; section number from memory). E_eff = s · E0.
 */
import type { SampledCurve } from './types'
import { extentOf, interpolateAt } from './interpolate'

/** Fewer overlapping points than this give no fit: one stray sample would set the answer. */
const MIN_FIT_POINTS = 3

export interface ModulusFit {
  /** Fitted effective modulus, MPa. */
  modulus: number
  /** s = E_eff / E0. */
  scale: number
  /** The modulus the predicted curve was computed with, MPa. */
  predictedModulus: number
  /** Measured points inside the predicted curve's displacement range that the fit used. */
  pointsUsed: number
  /** Root-mean-square of F_meas − s·F_pred over the points used (force unit of the curves). */
  residualRms: number
  /** 1 − Σ residual² / Σ F_meas² (uncentred, as for a regression through the origin). */
  rSquared: number
}

export type ModulusFitResult = { fit: ModulusFit; reason: null } | { fit: null; reason: string }

/**
 * Fits E_eff by least squares on the predicted curve's scaling, interpolating the predicted
 * curve at the measured displacements (only where the prediction reaches).
 * @param predictedModulus E0 in MPa, the modulus behind `predicted`.
 */
export function fitModulus(measured: SampledCurve, predicted: SampledCurve, predictedModulus: number): ModulusFitResult {
  if (!(predictedModulus > 0) || !Number.isFinite(predictedModulus)) {
    return { fit: null, reason: 'the predicted modulus must be a positive number of MPa' }
  }
  const [lo, hi] = extentOf(predicted.displacement)
  const pairs: Array<[number, number]> = []
  for (let i = 0; i < measured.displacement.length; i++) {
    const d = measured.displacement[i]
    if (d < lo || d > hi) continue
    const fp = interpolateAt(predicted.displacement, predicted.force, d)
    if (fp !== null) pairs.push([measured.force[i], fp])
  }
  if (pairs.length < MIN_FIT_POINTS) {
    return { fit: null, reason: `only ${pairs.length} measured point(s) lie inside the predicted curve's range ${lo}–${hi}; at least ${MIN_FIT_POINTS} are needed` }
  }
  let sumMP = 0
  let sumPP = 0
  let sumMM = 0
  for (const [m, p] of pairs) {
    sumMP += m * p
    sumPP += p * p
    sumMM += m * m
  }
  if (sumPP === 0) return { fit: null, reason: 'the predicted force is zero at every measured point, so no scale can be fitted' }
  const scale = sumMP / sumPP
  let sumRR = 0
  for (const [m, p] of pairs) sumRR += (m - scale * p) ** 2
  return {
    fit: {
      modulus: scale * predictedModulus,
      scale,
      predictedModulus,
      pointsUsed: pairs.length,
      residualRms: Math.sqrt(sumRR / pairs.length),
      rSquared: sumMM > 0 ? 1 - sumRR / sumMM : 0,
    },
    reason: null,
  }
}
