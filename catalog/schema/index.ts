export * from './types'
export { validateParams, paramsSchema, DEFAULT_MATERIAL_ID } from './validate'
export type { ParamRanges, ValidateOptions, ValidatedParams } from './validate'
