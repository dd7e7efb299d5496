import { SolverError } from '../errors'
import { compileFrame } from './frame-model'
import type { Frame, PathRequest, PathResult } from './types'
import { DEFAULT_POINTS, emptyResult, recordPoint, Workspace } from './workspace'

const MIN_ARC_FRACTION = 1e-7
const FAST_ITERATIONS = 3
const SLOW_ITERATIONS = 7
/** Most steps per requested point before the path is declared lost. */
const STEPS_PER_POINT = 50

/**
 * Crisfield's cylindrical arc-length method (Crisfield, Computers & Structures 13:55–62, 1981;
 * Riks, Int. J. Solids Struct. 15:529–551, 1979): the control dof carries a force P, and each
 * step moves a fixed distance Δs in displacement space, ‖Δu‖_W = Δs, so P may fall and the
 * control displacement may reverse (snap-back). Rotations are weighted by the mean element
 * length so that the norm has one unit (mm).
 */
export function followArcLength(frame: Frame, request: PathRequest): PathResult {
  const points = request.points ?? DEFAULT_POINTS
  if (!(Number.isInteger(points) && points >= 2)) throw new SolverError('path: points must be a whole number of at least 2')
  if (!Number.isFinite(request.target) || request.target === 0) throw new SolverError('path: target must be a finite, non-zero control value')
  const model = compileFrame(frame, request.control, false, request.imperfection)
  const ws = new Workspace(model, request)
  const result = emptyResult(request.track?.length ?? 0)
  const n = model.equationCount
  const qc = model.equation[model.control]
  const target = request.target
  const spacing = target / (points - 1)

  const weight = new Float64Array(n)
  for (let q = 0; q < n; q++) weight[q] = ws.dofOf[q] % 3 === 2 ? model.lengthScale ** 2 : 1
  const dotW = (a: Float64Array, b: Float64Array) => { let s = 0; for (let q = 0; q < n; q++) s += weight[q] * a[q] * b[q]; return s }

  const uDone = new Float64Array(ws.u.length)
  const du = new Float64Array(n) // increment of this step, by equation
  const duPrev = new Float64Array(n)
  const dr = new Float64Array(n)
  const dt = new Float64Array(n)
  const duTrial = new Float64Array(n)
  let P = 0, PDone = 0

  const assembleLoaded = () => {
    const norm0 = ws.assemble()
    if (qc < 0) return norm0
    ws.residual[qc] -= P
    let norm = 0
    for (let q = 0; q < n; q++) norm = Math.max(norm, Math.abs(ws.residual[q]))
    return norm
  }
  const loadTangent = (into: Float64Array) => { into.fill(0); into[qc] = 1; ws.solve(into) }

  // start: the unloaded frame is in equilibrium
  let norm = assembleLoaded()
  if (!(norm <= ws.threshold(0)) || !ws.factor()) {
    throw new SolverError(`path: no regular equilibrium at the start (residual ${norm.toExponential(3)})`, { step: 0, residual: norm })
  }
  recordPoint(result, ws, request, 0, 0, ws.state.maxStrain, ws.tangent.negativePivots === 0)
  loadTangent(dt)
  const arc0 = Math.abs(spacing / dt[qc]) * Math.sqrt(dotW(dt, dt))
  let arc = arc0
  let direction = Math.sign(target * dt[qc]) || 1
  let first = true

  for (let steps = 0; ; steps++) {
    if (steps > STEPS_PER_POINT * points) {
      throw new SolverError(`path: arc-length did not reach the target ${target} in ${steps} steps (control at ${ws.u[model.control].toPrecision(6)})`, { step: steps })
    }
    uDone.set(ws.u)
    PDone = P
    // predictor along the tangent (dt is K⁻¹e_c at the converged state)
    let sign = direction
    if (!first) sign = dotW(dt, duPrev) >= 0 ? 1 : -1
    const dP0 = (sign * arc) / Math.sqrt(dotW(dt, dt))
    for (let q = 0; q < n; q++) du[q] = dP0 * dt[q]
    let dP = dP0
    ws.addToFree(du, 1)
    P = PDone + dP

    let converged = false
    let iterations = 0
    for (; iterations <= ws.maxIterations; iterations++) {
      norm = assembleLoaded()
      if (!Number.isFinite(norm)) break
      const regular = ws.factor()
      if (norm <= ws.threshold(P)) { converged = regular; break }
      if (!regular || iterations === ws.maxIterations) break
      for (let q = 0; q < n; q++) dr[q] = -ws.residual[q]
      ws.solve(dr)
      loadTangent(dt)
      // ‖du + dr + δP·dt‖²_W = arc²
      for (let q = 0; q < n; q++) duTrial[q] = du[q] + dr[q]
      const a = dotW(dt, dt), b = 2 * dotW(dt, duTrial), c = dotW(duTrial, duTrial) - arc * arc
      const disc = b * b - 4 * a * c
      if (!(disc >= 0)) break
      const root = Math.sqrt(disc)
      const r1 = (-b + root) / (2 * a), r2 = (-b - root) / (2 * a)
      // the root that keeps the increment closest to its previous direction
      const pick = (dPi: number) => { let s = 0; for (let q = 0; q < n; q++) s += weight[q] * (duTrial[q] + dPi * dt[q]) * du[q]; return s }
      const dPc = pick(r1) >= pick(r2) ? r1 : r2
      for (let q = 0; q < n; q++) { const d = dr[q] + dPc * dt[q]; du[q] += d; dr[q] = d }
      ws.addToFree(dr, 1)
      dP += dPc
      P = PDone + dP
    }
    const uc = ws.u[model.control]
    const ucDone = uDone[model.control]
    if (converged && Math.abs(uc - ucDone) > 1.5 * Math.abs(spacing)) converged = false
    if (!converged) {
      ws.iterations += iterations
      ws.u.set(uDone)
      P = PDone
      arc /= 4
      if (arc < MIN_ARC_FRACTION * arc0) {
        throw new SolverError(
          `path: arc-length step ${result.steps + 1} did not converge near control ${ucDone.toPrecision(6)} (load ${PDone.toPrecision(6)}), residual ${norm.toExponential(3)} N`,
          { step: result.steps + 1, control: ucDone, residual: norm },
        )
      }
      // the tangent must be refactored at the last converged state
      assembleLoaded(); ws.factor(); loadTangent(dt)
      continue
    }
    ws.iterations += iterations
    ws.reactionScale = Math.max(ws.reactionScale, Math.abs(P))
    result.steps++
    first = false
    duPrev.set(du)
    if ((uc - target) * Math.sign(target) >= 0) {
      landOnTarget(ws, uDone, ucDone, PDone, uc, P, target, qc, result, request)
      result.iterations = ws.iterations
      return result
    }
    recordPoint(result, ws, request, uc, P, ws.state.maxStrain, ws.tangent.negativePivots === 0)
    loadTangent(dt)
    if (iterations <= FAST_ITERATIONS) arc = Math.min(4 * arc0, arc * 2)
    else if (iterations > SLOW_ITERATIONS) arc /= 2
  }
}

/**
 * The step crossed the target: start from the state interpolated between the two ends of the
 * step and iterate with the control displacement held at the target (the load is the unknown
 * that keeps it there: δP = (target − u_c − δr_c)/δt_c).
 */
function landOnTarget(ws: Workspace, uDone: Float64Array, ucDone: number, PDone: number, uc: number, P: number, target: number, qc: number, result: PathResult, request: PathRequest): void {
  const s = (target - ucDone) / (uc - ucDone)
  const uEnd = new Float64Array(ws.u)
  for (let i = 0; i < ws.u.length; i++) ws.u[i] = uDone[i] + s * (uEnd[i] - uDone[i])
  let load = PDone + s * (P - PDone)
  const n = ws.model.equationCount
  const dr = new Float64Array(n), dt = new Float64Array(n)
  let norm = Infinity
  for (let it = 0; it <= ws.maxIterations; it++) {
    norm = ws.assemble()
    ws.residual[qc] -= load
    norm = 0
    for (let q = 0; q < n; q++) norm = Math.max(norm, Math.abs(ws.residual[q]))
    const regular = ws.factor()
    const offTarget = Math.abs(ws.u[ws.model.control] - target)
    if (norm <= ws.threshold(load) && offTarget <= 1e-12 * Math.abs(target)) {
      ws.iterations += it
      recordPoint(result, ws, request, target, load, ws.state.maxStrain, regular && ws.tangent.negativePivots === 0)
      return
    }
    if (!regular) break
    for (let q = 0; q < n; q++) dr[q] = -ws.residual[q]
    ws.solve(dr)
    dt.fill(0); dt[qc] = 1; ws.solve(dt)
    const dP = (target - ws.u[ws.model.control] - dr[qc]) / dt[qc]
    for (let q = 0; q < n; q++) dr[q] += dP * dt[q]
    ws.addToFree(dr, 1)
    load += dP
  }
  throw new SolverError(`path: arc-length could not land on the target ${target} (residual ${norm.toExponential(3)} N)`, { control: target, residual: norm })
}
