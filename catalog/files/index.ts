/** Files for CAD, slicers and documents, each written from the one built solid. */
export { indexedMesh, type IndexedMesh } from './mesh'
export { profileOf, type Profile } from './profile'
export { serialize3mf, type PartMetadata } from './threemf'
export { serializeDxf } from './dxf'
export { serializeProfileSvg } from './svg'

export { PART_FORMATS, type PartFormat } from './formats'
export { buildPartFile } from './build'
