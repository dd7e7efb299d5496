export { toleranceBand } from './band'
export type { ToleranceBand } from './band'

export { curveBand, valuesAt } from './curve-band'

export { DEFAULT_TOLERANCE, DEFAULT_TOLERANCE_NOTE, resolveTolerance } from './defaults'
