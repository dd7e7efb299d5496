import { SolverError } from '../errors'
import { bandFactor, bandSolve, type BandMatrix } from './band'
import { assemble, updateSlaves, type AssemblyState } from './assemble'
import { createTangent, type FrameModel } from './frame-model'
import type { PathRequest, PathResult } from './types'

const DEFAULT_TOLERANCE = 1e-6
/** Floor of the residual scale (fraction of the frame's force scale) while reactions are still ~0. */
const SCALE_FLOOR = 1e-6
const DEFAULT_MAX_ITERATIONS = 25
export const DEFAULT_POINTS = 101

/** Preallocated arrays for one path: nothing is allocated per Newton iteration. */
export class Workspace {
  readonly model: FrameModel
  /** All node displacements (ux, uy, θ per node). */
  readonly u: Float64Array
  readonly residual: Float64Array
  readonly delta: Float64Array
  readonly kfc: Float64Array
  readonly tangent: BandMatrix
  /** Global dof of each equation. */
  readonly dofOf: Int32Array
  readonly state: AssemblyState = { reaction: 0, kcc: 0, maxStrain: 0 }
  readonly tolerance: number
  readonly maxIterations: number
  iterations = 0
  /** Largest |reaction| met so far on the path, N: the scale the residual is compared with. */
  reactionScale = 0

  constructor(model: FrameModel, request: PathRequest) {
    this.model = model
    this.u = new Float64Array(3 * model.nodeCount)
    this.residual = new Float64Array(model.equationCount)
    this.delta = new Float64Array(model.equationCount)
    this.kfc = new Float64Array(model.equationCount)
    this.tangent = createTangent(model)
    this.dofOf = new Int32Array(model.equationCount)
    for (let g = 0; g < model.equation.length; g++) if (model.equation[g] >= 0) this.dofOf[model.equation[g]] = g
    this.tolerance = request.tolerance ?? DEFAULT_TOLERANCE
    this.maxIterations = request.maxIterations ?? DEFAULT_MAX_ITERATIONS
    if (!(this.tolerance > 0)) throw new SolverError('path: tolerance must be positive')
    if (!(Number.isInteger(this.maxIterations) && this.maxIterations >= 1)) throw new SolverError('path: maxIterations must be a whole number of at least 1')
  }

  /** Residual convergence threshold, N: relative to the reactions met along the path. */
  threshold(reaction: number): number {
    return this.tolerance * Math.max(this.reactionScale, Math.abs(reaction), SCALE_FLOOR * this.model.forceScale)
  }

  /** Assembles residual and tangent at the current u; returns max |residual|. */
  assemble(): number {
    assemble(this.model, this.u, this.residual, this.tangent, this.kfc, this.state)
    let norm = 0
    const r = this.residual
    for (let i = 0; i < r.length; i++) { const a = Math.abs(r[i]); if (a > norm) norm = a }
    return norm
  }

  /** Factors the tangent; returns false when it is singular. */
  factor(): boolean {
    return bandFactor(this.tangent) < 0
  }

  solve(b: Float64Array): void {
    bandSolve(this.tangent, b)
  }

  /** u[free] += scale · x (x indexed by equation), then moves the rigid-link slaves. */
  addToFree(x: Float64Array, scale: number): void {
    const { u, dofOf } = this
    for (let q = 0; q < x.length; q++) u[dofOf[q]] += scale * x[q]
    updateSlaves(this.model, u)
  }

  updateSlaves(): void {
    updateSlaves(this.model, this.u)
  }
}

/** The arrays of a PathResult being filled. */
export function emptyResult(trackCount: number): PathResult {
  return { control: [], reaction: [], maxStrain: [], tracked: Array.from({ length: trackCount }, () => []), iterations: 0, stable: [], extrema: [], steps: 0, jumps: [], stabilityLoss: [] }
}

export function recordPoint(result: PathResult, ws: Workspace, request: PathRequest, control: number, reaction: number, maxStrain: number, stable: boolean): number {
  result.control.push(control)
  result.reaction.push(reaction)
  result.maxStrain.push(maxStrain)
  result.stable.push(stable)
  const track = request.track ?? []
  for (let i = 0; i < track.length; i++) result.tracked[i].push(ws.u[3 * track[i].node + track[i].dof])
  return result.control.length - 1
}
