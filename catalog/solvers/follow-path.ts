import { followArcLength } from './arc-length'
import { followDisplacement } from './displacement-control'
import type { Frame, PathRequest, PathResult } from './types'

/**
 * Follows the equilibrium path of a frame while its control dof goes from 0 to `target`.
 * 'displacement' (default): Newton–Raphson at prescribed control values with adaptive steps
 * that land on `points` evenly spread stations, plus located extrema of the reaction.
 * 'arc-length': Crisfield's cylindrical arc-length method, the control dof loaded by a force,
 * so limit points and snap-back of the control dof are passed; every converged step is returned.
 * Throws SolverError (with the step and residual) when the path cannot be followed.
 */
export function followPath(frame: Frame, request: PathRequest): PathResult {
  return request.strategy === 'arc-length' ? followArcLength(frame, request) : followDisplacement(frame, request)
}
