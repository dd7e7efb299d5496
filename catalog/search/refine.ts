/**
 * Local refinement around a good candidate: a coordinate (compass) search on the continuous
 * parameters and the print height (in whole layers) — try one step up and down each parameter, move on the first improvement, halve
 * the steps when none improves, stop below the parameter's own step. It climbs the candidate's
 * objective (the smallest margin over the band), so it both widens the margin of a feasible
 * candidate and can walk a near miss into a narrow window the grid stepped over.
 */
import type { CandidateJudge } from './candidate'
import { snapToStep, type Axis } from './sampling'

/** Evaluations allowed per refinement. */
const REFINE_EVALUATIONS = 160

export interface Refined {
  params: Record<string, number>
  /** Whether the best found meets the window (the start's verdict when nothing improved). */
  ok: boolean
  objective: number
}

/**
 * `evaluate(trial, floor)` judges each trial with `judge` and leaves its verdict in the judge's
 * fields — or, where the trial's objective is certainly no more than `floor` (the best so
 * far, which it then cannot replace), may leave only an upper bound of it (CandidateJudge.bound):
 * the climb reads the objective of a trial that beats the floor, and the verdict of none
 * other. The params object is reused, so copy it to keep it.
 */
export function refine(
  judge: CandidateJudge,
  axes: Axis[],
  start: Record<string, number>,
  startVerdict: { ok: boolean; objective: number },
  evaluate: (params: Record<string, number>, floor: number) => void,
): Refined {
  let best = { ...start }
  let bestObjective = startVerdict.objective
  let bestOk = startVerdict.ok
  const trial = { ...start }
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
        for (const key in best) trial[key] = best[key]
        trial[spec.key] = v
        evaluations++
        evaluate(trial, bestObjective + 1e-12)
        if (judge.objective > bestObjective + 1e-12) {
          best = { ...trial }
          bestObjective = judge.objective
          bestOk = judge.ok
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
  return { params: best, ok: bestOk, objective: bestObjective }
}
