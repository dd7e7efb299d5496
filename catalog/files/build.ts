/**
 * A 3MF, DXF or SVG of a family's solid for validated parameters: buildGeometry (the one place
 * a solid is built, so a cache of solids by parameters serves every format) and the format's
 * writer. Bytes for 3MF, text for the others.
 */
import { buildGeometry } from '../evaluate'
import { getFamily } from '../registry'
import { validateParams } from '../schema/validate'
import { serializeDxf } from './dxf'
import type { PartFormat } from './formats'
import { serializeProfileSvg } from './svg'
import { serialize3mf, type PartMetadata } from './threemf'

export function buildPartFile(format: PartFormat, familyId: string, rawParams: unknown, meta: Omit<PartMetadata, 'family' | 'params'>): Uint8Array | string {
  const family = getFamily(familyId)
  const { params } = validateParams(family, rawParams)
  const solid = buildGeometry(familyId, params)
  const full: PartMetadata = { ...meta, family: familyId, params }
  switch (format) {
    case '3mf': return serialize3mf(solid, full)
    case 'dxf': return serializeDxf(solid, full)
    case 'svg': {
      const labels = Object.fromEntries(family.params.map((p) => [p.key, p.unit ? `${p.label.toLowerCase()} (${p.unit})` : p.label.toLowerCase()]))
      return serializeProfileSvg(solid, full, { labels })
    }
  }
}
