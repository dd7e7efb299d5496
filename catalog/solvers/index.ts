export * from './types'
export { followPath } from './follow-path'
export { rectangleSection } from './section'
export { meshCurve, meshPolyline, meshStraight } from './mesh'
export { createBandMatrix, bandAdd, bandFactor, bandSolve } from './band'

export { SOLVER_VERSION } from './version'
export { firstCrossing, sampleAt, indicesUpTo, strainLimitedStop } from './path-sampling'
