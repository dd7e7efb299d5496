import { SolverError } from '../errors'
import { compileFrame } from './frame-model'
import type { Frame, PathRequest, PathResult } from './types'
import { DEFAULT_POINTS, emptyResult, recordPoint, Workspace } from './workspace'

/** Smallest step, as a fraction of the station spacing, before the path is given up. */
const MIN_STEP_FRACTION = 1e-7
/** Newton iterations at or below which the step grows, and above which it shrinks. */
const FAST_ITERATIONS = 3
const SLOW_ITERATIONS = 7
/** Below this step (fraction of the station spacing) a loss of stability is accepted as real. */
const STABILITY_STEP_FRACTION = 1e-4
/** Regula-falsi iterations and relative interval width when locating an extremum. */
const EXTREMUM_ITERATIONS = 60
const EXTREMUM_WIDTH = 1e-9
const EXTREMUM_REACTION = 1e-7
/**
 * A converged step that is not the continuation of the last state (leftBranch) is retried
 * shorter: near a fold no equilibrium lies ahead on the branch, and Newton finds one on
 * another. Below FOLD_STEP_FRACTION of the station spacing, a state still jumping with the
 * reaction changing by more than FOLD_REACTION of the reaction scale is a fold of the path in
 * the control value (a limit point in displacement): the part snaps there.
 */
const FOLD_STEP_FRACTION = 1e-6
const FOLD_REACTION = 1e-3

interface Snapshot {
  lambda: number
  u: Float64Array
  /** du_free/dλ along the path (the tangent predictor). */
  rate: Float64Array
  slope: number
  reaction: number
  maxStrain: number
  stable: boolean
}

function snapshot(ws: Workspace): Snapshot {
  return { lambda: 0, u: new Float64Array(ws.u.length), rate: new Float64Array(ws.kfc.length), slope: 0, reaction: 0, maxStrain: 0, stable: true }
}

function copyInto(to: Snapshot, from: Snapshot): void {
  to.lambda = from.lambda
  to.u.set(from.u)
  to.rate.set(from.rate)
  to.slope = from.slope
  to.reaction = from.reaction
  to.maxStrain = from.maxStrain
  to.stable = from.stable
}

/**
 * Newton–Raphson at a prescribed control value, starting from the current u. On success the
 * converged tangent is factored and `into` receives the state, the path rate and the slope
 * dR/dλ = K_cc − K_cf K_ff⁻¹ K_fc (static condensation onto the control dof).
 */
function solveAt(ws: Workspace, lambda: number, into: Snapshot): { converged: boolean; residual: number; iterations: number } {
  const { u, residual, delta, model } = ws
  u[model.control] = lambda
  ws.updateSlaves()
  let norm = Infinity
  const stepTolerance = ws.tolerance * model.lengthScale
  for (let it = 0; it <= ws.maxIterations; it++) {
    norm = ws.assemble()
    if (!Number.isFinite(norm)) break
    const regular = ws.factor()
    let converged = norm <= ws.threshold(ws.state.reaction)
    let correction = 0
    if (!converged && regular && it < ws.maxIterations) {
      for (let q = 0; q < delta.length; q++) delta[q] = -residual[q]
      ws.solve(delta)
      ws.addToFree(delta, 1)
      let size = 0
      for (let q = 0; q < delta.length; q++) { const a = Math.abs(delta[q]); if (a > size) size = a; correction += ws.kfc[q] * delta[q] }
      if (!Number.isFinite(size)) break
      // Newton converges quadratically: a correction this small leaves a negligible residual,
      // so the state is accepted without another assembly (reaction updated to first order)
      converged = size <= stepTolerance
      if (!converged) continue
    }
    if (!converged) break
    ws.iterations += it + 1
    ws.reactionScale = Math.max(ws.reactionScale, Math.abs(ws.state.reaction))
    into.lambda = lambda
    into.u.set(u)
    into.reaction = ws.state.reaction + correction
    into.maxStrain = ws.state.maxStrain
    if (regular) {
      into.rate.set(ws.kfc)
      ws.solve(into.rate)
      let condensed = ws.state.kcc
      for (let q = 0; q < into.rate.length; q++) condensed -= ws.kfc[q] * into.rate[q]
      into.slope = condensed
      for (let q = 0; q < into.rate.length; q++) into.rate[q] = -into.rate[q]
      into.stable = ws.tangent.negativePivots === 0
    } else {
      into.rate.fill(0)
      into.slope = 0
      into.stable = false
    }
    return { converged: true, residual: norm, iterations: it + 1 }
  }
  ws.iterations += ws.maxIterations
  return { converged: false, residual: norm, iterations: ws.maxIterations }
}

/** Sets u to the predictor from a converged snapshot: u + rate·(λ − λ0). */
function predictFrom(ws: Workspace, from: Snapshot, lambda: number): void {
  ws.u.set(from.u)
  ws.addToFree(from.rate, lambda - from.lambda)
}

/**
 * Quadratic predictor through the previous converged state and the current one with its
 * tangent: u(λ) ≈ u0 + r0·Δ + c·Δ², c = (u₋₁ − u0 + r0·h)/h², h = λ0 − λ₋₁. One Newton
 * iteration fewer per step than the tangent alone on smooth stretches.
 */
function predictQuadratic(ws: Workspace, from: Snapshot, before: Snapshot, lambda: number): void {
  const h = from.lambda - before.lambda
  const d = lambda - from.lambda
  const { u, dofOf } = ws
  u.set(from.u)
  const w = (d * d) / (h * h)
  for (let q = 0; q < dofOf.length; q++) {
    const g = dofOf[q]
    u[g] += from.rate[q] * d + w * (before.u[g] - from.u[g] + from.rate[q] * h)
  }
  ws.updateSlaves()
}

/** Path following under displacement control of one dof with adaptive steps. */
export function followDisplacement(frame: Frame, request: PathRequest): PathResult {
  const points = request.points ?? DEFAULT_POINTS
  if (!(Number.isInteger(points) && points >= 2)) throw new SolverError('path: points must be a whole number of at least 2')
  if (!Number.isFinite(request.target) || request.target === 0) throw new SolverError('path: target must be a finite, non-zero control value')
  const model = compileFrame(frame, request.control, true, request.imperfection)
  const ws = new Workspace(model, request)
  const result = emptyResult(request.track?.length ?? 0)
  const findExtrema = request.extrema ?? true

  const stationCount = points - 1
  const target = request.target
  const spacing = target / stationCount
  const station = (k: number) => (k === stationCount ? target : (target * k) / stationCount)

  const done = snapshot(ws)
  const trial = snapshot(ws)
  const lo = snapshot(ws)
  const hi = snapshot(ws)
  const mid = snapshot(ws)
  const best = snapshot(ws)
  const before = snapshot(ws)
  let haveBefore = false
  // a stable state on another branch, met by a step that overshot a fold: where the part lands
  const landedAt = snapshot(ws)
  let haveLanding = false
  const jumpTo = (to: Snapshot) => {
    // the last state on the branch is the fold: the curve shows it, then where the part lands
    ws.u.set(done.u)
    recordPoint(result, ws, request, done.lambda, done.reaction, done.maxStrain, done.stable)
    result.jumps.push(done.lambda)
    result.steps++
    ws.u.set(to.u)
    recordPoint(result, ws, request, to.lambda, to.reaction, to.maxStrain, to.stable)
    copyInto(before, done)
    haveBefore = false
    copyInto(done, to)
    haveLanding = false
    step = spacing / 4
  }

  const start = solveAt(ws, 0, done)
  if (!start.converged) {
    throw new SolverError(`path: no equilibrium at the start (control 0), residual ${start.residual.toExponential(3)}`, { step: 0, residual: start.residual })
  }
  recordPoint(result, ws, request, 0, done.reaction, done.maxStrain, done.stable)

  let step = spacing
  let next = 1
  while (next <= stationCount) {
    const stationValue = station(next)
    let lambda = done.lambda + step
    const landing = (lambda - stationValue) * Math.sign(target) >= -1e-12 * Math.abs(spacing)
    if (landing) lambda = stationValue
    if (haveBefore) predictQuadratic(ws, done, before, lambda)
    else predictFrom(ws, done, lambda)
    const outcome = solveAt(ws, lambda, trial)
    if (!outcome.converged) {
      step /= 4
      if (Math.abs(step) < MIN_STEP_FRACTION * Math.abs(spacing) && haveLanding) {
        // no equilibrium just ahead on this branch: the fold; the part lands where the longer step found it
        jumpTo(landedAt)
        continue
      }
      if (Math.abs(step) < MIN_STEP_FRACTION * Math.abs(spacing) && jumpPastFold(ws, done, trial, spacing, result, request)) {
        // the path folded back (a snap under displacement control): continue on the branch it jumps to
        step = spacing / 4
        copyInto(before, done)
        haveBefore = false
        copyInto(done, trial)
        result.steps++
        continue
      }
      if (Math.abs(step) < MIN_STEP_FRACTION * Math.abs(spacing)) {
        throw new SolverError(
          `path: Newton did not converge at control ${lambda.toPrecision(6)} (step ${result.steps + 1}, from ${done.lambda.toPrecision(6)}), residual ${outcome.residual.toExponential(3)} N after ${outcome.iterations} iterations`,
          { step: result.steps + 1, control: lambda, residual: outcome.residual },
        )
      }
      continue
    }
    let fold = false
    if (leftBranch(ws, done, trial)) {
      if (Math.abs(step) > FOLD_STEP_FRACTION * Math.abs(spacing)) {
        if (trial.stable) { copyInto(landedAt, trial); haveLanding = true }
        step /= 4
        continue
      }
      // the step is down to a sliver of the spacing and the state still jumps: a fold when the
      // reaction jumps too (a sharp but continuous corner of the path changes it by |slope|·step)
      fold = Math.abs(trial.reaction - done.reaction) > FOLD_REACTION * ws.reactionScale
    }
    if (fold) {
      jumpTo(trial)
      continue
    }
    if (done.stable && !trial.stable && Math.abs(step) > STABILITY_STEP_FRACTION * Math.abs(spacing)) {
      // a stable path turning unstable is usually a step that jumped onto another branch near
      // a bifurcation; retry shorter, and accept only when the path itself loses stability
      step /= 4
      continue
    }
    result.steps++
    if (done.stable && !trial.stable) result.stabilityLoss.push({ control: trial.lambda, reaction: trial.reaction })
    // across a turn of the path the previous state says nothing about the next step
    const turned = done.slope !== 0 && trial.slope !== 0 && Math.sign(done.slope) !== Math.sign(trial.slope)
    if (findExtrema && turned && done.slope !== 0 && trial.slope !== 0 && Math.sign(done.slope) !== Math.sign(trial.slope)) {
      copyInto(lo, done)
      copyInto(hi, trial)
      if (locateExtremum(ws, lo, hi, mid, best)) {
        ws.u.set(best.u)
        const index = recordPoint(result, ws, request, best.lambda, best.reaction, best.maxStrain, best.stable)
        result.extrema.push({ kind: (done.slope > 0) === (trial.lambda > done.lambda) ? 'max' : 'min', control: best.lambda, reaction: best.reaction, maxStrain: best.maxStrain, index })
      }
      ws.u.set(trial.u)
    }
    copyInto(before, done)
    haveBefore = !turned
    copyInto(done, trial)
    if (haveLanding && (landedAt.lambda - done.lambda) * Math.sign(target) <= 0) haveLanding = false
    if (landing) {
      ws.u.set(done.u)
      recordPoint(result, ws, request, done.lambda, done.reaction, done.maxStrain, done.stable)
      next++
    }
    if (outcome.iterations <= FAST_ITERATIONS) step = Math.sign(spacing) * Math.min(Math.abs(spacing), Math.abs(step) * 2)
    else if (outcome.iterations > SLOW_ITERATIONS) step /= 2
  }
  result.iterations = ws.iterations
  return result
}

/**
 * Locates where the path slope changes sign between two converged states (Illinois variant
 * of regula falsi: Dowell & Jarratt, BIT 11:168–174, 1971). Leaves in `best` the interior
 * state of largest (max) or smallest (min) reaction met; returns false when none converged.
 */
function locateExtremum(ws: Workspace, lo: Snapshot, hi: Snapshot, mid: Snapshot, best: Snapshot): boolean {
  // dR/dλ > 0 on the side of smaller λ means the reaction rises into a maximum
  const isMax = (lo.slope > 0) === (hi.lambda > lo.lambda)
  let found = false
  let sLo = lo.slope, sHi = hi.slope
  let side = 0
  const width0 = Math.abs(hi.lambda - lo.lambda)
  for (let it = 0; it < EXTREMUM_ITERATIONS; it++) {
    const width = Math.abs(hi.lambda - lo.lambda)
    if (found && width <= EXTREMUM_WIDTH * width0) break
    let lambda = (lo.lambda * sHi - hi.lambda * sLo) / (sHi - sLo)
    // keep strictly inside the bracket so that every trial shrinks it
    const margin = 1e-3 * width
    const a = Math.min(lo.lambda, hi.lambda) + margin, b = Math.max(lo.lambda, hi.lambda) - margin
    if (!(lambda >= a)) lambda = a
    if (!(lambda <= b)) lambda = b
    const nearer = Math.abs(lambda - lo.lambda) <= Math.abs(hi.lambda - lambda) ? lo : hi
    predictFrom(ws, nearer, lambda)
    if (!solveAt(ws, lambda, mid).converged) break
    if (lo.stable && hi.stable && !mid.stable) {
      // landed on the unstable continuation of a branch beyond a kink: come from the other side
      predictFrom(ws, nearer === lo ? hi : lo, lambda)
      if (!solveAt(ws, lambda, mid).converged || !mid.stable) break
    }
    if (!found || (mid.reaction > best.reaction) === isMax) copyInto(best, mid)
    found = true
    // the reaction cannot move by more than |slope|·width inside the bracket
    if (mid.slope === 0 || Math.abs(mid.slope) * width <= EXTREMUM_REACTION * Math.abs(mid.reaction)) break
    if (Math.sign(mid.slope) === Math.sign(sLo)) {
      copyInto(lo, mid)
      sLo = mid.slope
      if (side === -1) sHi /= 2
      side = -1
    } else {
      copyInto(hi, mid)
      sHi = mid.slope
      if (side === 1) sLo /= 2
      side = 1
    }
  }
  return found
}

/**
 * Whether the converged `trial` is not the continuation of `done`: its reaction differs from
 * the tangent's prediction by more than the predicted change itself plus FOLD_REACTION of the
 * reaction scale. Near a fold the tangent slope grows without bound, so the criterion lets a
 * step reach about four times the distance left to the fold and no further; a step past it
 * lands on the branch the part snaps to, with the reaction jumping against the slope.
 */
function leftBranch(ws: Workspace, done: Snapshot, trial: Snapshot): boolean {
  const expected = done.slope * (trial.lambda - done.lambda)
  return Math.abs(trial.reaction - done.reaction - expected) > Math.abs(expected) + FOLD_REACTION * ws.reactionScale
}

/**
 * At a fold of the path under displacement control no equilibrium lies just ahead: the part
 * snaps. Looks for a stable equilibrium a little further on (a quarter station, then half, one),
 * starting from the last state, and records the jump. Returns false when none is found.
 */
function jumpPastFold(ws: Workspace, done: Snapshot, into: Snapshot, spacing: number, result: PathResult, request: PathRequest): boolean {
  for (const ahead of [0.25, 0.5, 1]) {
    const lambda = done.lambda + ahead * spacing
    ws.u.set(done.u)
    if (solveAt(ws, lambda, into).converged && into.stable) {
      ws.u.set(done.u)
      recordPoint(result, ws, request, done.lambda, done.reaction, done.maxStrain, done.stable)
      result.jumps.push(done.lambda)
      ws.u.set(into.u)
      recordPoint(result, ws, request, into.lambda, into.reaction, into.maxStrain, into.stable)
      return true
    }
  }
  return false
}
