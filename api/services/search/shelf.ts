/**
 * The shelf as search reads it: released entries in the catalog's ShelfEntry shape (the
 * same shape `flexshelf search --shelf` reads), the curated materials as numbers, and a
 * fingerprint of both, so cached answers die with the shelf they were computed from.
 */
import { createHash } from 'node:crypto'
import type { SearchMaterial, ShelfEntry } from '../../../catalog'
import type { AppContext } from '../../context'
import { listMaterials } from '../materials'

export interface ShelfSnapshot {
  entries: ShelfEntry[]
  materials: SearchMaterial[]
  /** Hash of everything a search answer depends on (entries, their revisions, materials). */
  version: string
}

/** Released entries only: drafts are not on the shelf yet, retired ones no longer offered. */
export async function listShelfEntries(context: AppContext): Promise<ShelfEntry[]> {
  const { entries } = await loadShelf(context)
  return entries
}

export async function loadShelf(context: AppContext): Promise<ShelfSnapshot> {
  const rows = await context.db.models.Entry.findAll({
    where: { status: 'released' },
    attributes: ['id', 'familyId', 'name', 'summary', 'tags', 'materials', 'defaultParams', 'ranges', 'status', 'currentRevisionId'],
    order: [['id', 'ASC']],
  })
  const entries: ShelfEntry[] = rows.map((e) => ({
    id: e.id,
    familyId: e.familyId,
    name: e.name,
    summary: e.summary,
    tags: e.tags,
    materials: e.materials,
    defaultParams: e.defaultParams,
    ranges: e.ranges,
    status: 'released',
  }))
  const materials: SearchMaterial[] = (await listMaterials(context)).map((m) => ({ id: m.id, name: m.name, modulus: m.modulus, strainLimit: m.strainLimit, poissonRatio: m.poissonRatio }))
  const revisions = rows.map((e) => e.currentRevisionId ?? null)
  const version = createHash('sha1').update(JSON.stringify([entries, revisions, materials])).digest('hex')
  return { entries, materials, version }
}
