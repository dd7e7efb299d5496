export type { Material } from './types'
export { builtinMaterials, findBuiltinMaterial } from './builtin'
