/**
 * Free-text search over shelf entries (minisearch): names, summaries, tags, family and
 * materials, with prefix and fuzzy matching and field boosts. Rebuilt whenever the entries
 * change (`rebuild`), so it never serves a removed or renamed entry.
 */
import MiniSearch from 'minisearch'
import type { FamilyDefinition } from '../schema/types'
import type { ShelfEntry } from './types'

interface IndexedEntry {
  id: string
  name: string
  summary: string
  tags: string
  family: string
  materials: string
}

/** Names weigh most, then tags, then family words; summaries and materials count once. */
const FIELD_BOOSTS = { name: 3, tags: 2, family: 1.5, summary: 1, materials: 1 }
/** Edit distance allowed per term, as a fraction of its length (0.2: one typo in five letters). */
const FUZZY = 0.2

export interface TextHit {
  entryId: string | number
  score: number
}

export class ShelfTextIndex {
  private mini: MiniSearch<IndexedEntry>
  private ids = new Map<string, string | number>()

  constructor(entries: readonly ShelfEntry[], private families: readonly FamilyDefinition[]) {
    this.mini = ShelfTextIndex.empty()
    this.rebuild(entries)
  }

  private static empty() {
    return new MiniSearch<IndexedEntry>({
      fields: ['name', 'summary', 'tags', 'family', 'materials'],
      storeFields: [],
      searchOptions: { boost: FIELD_BOOSTS, prefix: true, fuzzy: FUZZY, combineWith: 'OR' },
    })
  }

  /** Replaces the whole index with these entries. */
  rebuild(entries: readonly ShelfEntry[]): void {
    this.mini = ShelfTextIndex.empty()
    this.ids.clear()
    this.mini.addAll(entries.map((e) => {
      const key = String(e.id)
      this.ids.set(key, e.id)
      const family = this.families.find((f) => f.id === e.familyId)
      return {
        id: key,
        name: e.name,
        summary: e.summary,
        tags: e.tags.join(' '),
        family: [e.familyId.replace(/-/g, ' '), family?.name ?? '', family?.kind ?? ''].join(' '),
        materials: e.materials.join(' '),
      }
    }))
  }

  get size(): number {
    return this.mini.documentCount
  }

  /** Matching entries, best first; empty for blank text. */
  search(text: string): TextHit[] {
    if (!text.trim()) return []
    return this.mini.search(text).map((r) => ({ entryId: this.ids.get(String(r.id))!, score: r.score }))
  }
}

export function createShelfIndex(entries: readonly ShelfEntry[], families: readonly FamilyDefinition[]): ShelfTextIndex {
  return new ShelfTextIndex(entries, families)
}
