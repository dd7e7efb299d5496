/**
 * Local refinement around a good candidate: a coordinate (compass) search on the continuous
 * parameters and the print height (in whole layers) — try one step up and down each parameter, move on the first improvement, halve
 * the steps when none improves, stop below the parameter's own step. It climbs the candidate's
 * objective (the smallest margin over the band), so it both widens the margin of a feasible
 * candidate and can walk a near miss into a narrow window the grid stepped over.
 */
import { scoreCandidate, type CandidateContext, type CandidateScore } from './candidate'
import { snapToStep, type Axis } from './sampling'

/** Evaluations allowed per refinement. */
export const REFINE_EVALUATIONS = 160

export interface Refined {
  params: Record<string, number>
  score: CandidateScore
}

export function refine(
  ctx: CandidateContext,
  axes: Axis[],
  start: Record<string, number>,
  startScore: CandidateScore,
  keys: string[],
  onEvaluated: (params: Record<string, number>, score: CandidateScore) => void,
): Refined {
  let best = { ...start }
  let bestScore = startScore
  const steps = axes.map((a) => (a.hi - a.lo) / Math.max(1, a.values.length - 1) / 2)
  let evaluations = 0
  while (evaluations < REFINE_EVALUATIONS) {
    let improved = false
    for (let i = 0; i < axes.length && !improved; i++) {
      const { spec, lo, hi } = axes[i]
      const unit = axes[i].step ?? spec.step
      if (steps[i] < unit / 2) continue
      for (const dir of [1, -1]) {
        const v = snapToStep(spec, Math.min(hi, Math.max(lo, best[spec.key] + dir * Math.max(steps[i], unit))), lo, hi, unit)
        if (Math.abs(v - best[spec.key]) < 1e-12) continue
        const trial = { ...best, [spec.key]: v }
        const score = scoreCandidate(ctx, trial, keys)
        evaluations++
        onEvaluated(trial, score)
        if (score.objective > bestScore.objective + 1e-12) {
          best = trial
          bestScore = score
          improved = true
          break
        }
      }
    }
    if (!improved) {
      let any = false
      for (let i = 0; i < steps.length; i++) {
        steps[i] /= 2
        if (steps[i] >= (axes[i].step ?? axes[i].spec.step) / 2) any = true
      }
      if (!any) break
    }
  }
  return { params: best, score: bestScore }
}
