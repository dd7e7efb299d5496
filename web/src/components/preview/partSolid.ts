/**
 * Builds a family's printable solid in the browser with the catalog's own geometry (the same
 * JSCAD code the server serializes to STL), as triangle positions for the preview. Each
 * family's geometry module is its own chunk, loaded the first time that family is previewed.
 */
import jscad from '@jscad/modeling'
import { polygonsToPositions } from '@/composables/previewGeometry'

type GeometryModule = { build: (params: Record<string, number>) => unknown }

const modules = import.meta.glob<GeometryModule>('../../../../catalog/families/*/geometry.ts')

function loaderFor(familyId: string): (() => Promise<GeometryModule>) | null {
  const key = Object.keys(modules).find((k) => k.endsWith(`/families/${familyId}/geometry.ts`))
  return key ? modules[key] : null
}

export function canPreview(familyId: string): boolean {
  return loaderFor(familyId) !== null
}

/** Triangle positions of the family's solid for these parameters (mm). */
export async function buildPartPositions(familyId: string, params: Record<string, number>): Promise<Float32Array> {
  const load = loaderFor(familyId)
  if (!load) throw new Error(`no geometry is known for the family "${familyId}"`)
  const { build } = await load()
  const solid = build(params) as Parameters<typeof jscad.geometries.geom3.toPolygons>[0]
  return polygonsToPositions(jscad.geometries.geom3.toPolygons(solid))
}
