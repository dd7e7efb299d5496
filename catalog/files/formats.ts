/** The take-away formats beside STL, with their media types (3MF: the 3MF Consortium's registration). */

export const PART_FORMATS = {
  '3mf': { contentType: 'model/3mf', extension: '3mf' },
  dxf: { contentType: 'image/vnd.dxf', extension: 'dxf' },
  svg: { contentType: 'image/svg+xml', extension: 'svg' },
} as const

export type PartFormat = keyof typeof PART_FORMATS
