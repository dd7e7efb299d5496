/**
 * Distinct answers, after ranking: a search that samples the ranges finely finds many
 * configurations of one entry in one material that differ by half a grid step, and ten such
 * rows say no more than one. So the ranked list is folded:
 *
 * - Within one entry and material, a configuration whose every parameter is within one step
 *   (the family's printable increment) or 3 % of a better-ranked listed design's is a close
 *   variant of that design, and folds under it ("12 close variants").
 * - The rest are distinct designs. The best design of each entry and material comes first
 *   (in rank order), then the further distinct designs (in rank order).
 *
 * So two listed designs of the same entry and material always differ by more than a step and
 * more than 3 % in at least one parameter; no two of them are within 3 % on every parameter.
 */
import type { FamilyDefinition } from '../schema/types'

/** A configuration is a close variant when every parameter is within this fraction (or one step). */
const CLOSE_FRACTION = 0.03

export interface Foldable {
  /** Entry and material: what a group is. */
  group: string
  family: FamilyDefinition
  params: Record<string, number>
}

export interface DistinctGroup<T> {
  lead: T
  /** 1 for the best design of its entry and material, 2 for a further distinct design. */
  tier: 1 | 2
  /** Close variants of the lead, best first. */
  variants: T[]
}

/** Whether every parameter of a and b lies within one step or CLOSE_FRACTION of each other. */
export function isCloseVariant(family: FamilyDefinition, a: Record<string, number>, b: Record<string, number>): boolean {
  for (const key of Object.keys(a)) {
    const x = a[key]
    const y = b[key]
    if (typeof x !== 'number' || typeof y !== 'number') continue
    if (x === y) continue
    const step = family.params.find((p) => p.key === key)?.step ?? 0
    // a hair of floating-point slack so that exactly one step counts as one step
    const allowed = Math.max(step, CLOSE_FRACTION * Math.max(Math.abs(x), Math.abs(y))) * (1 + 1e-9)
    if (Math.abs(x - y) > allowed) return false
  }
  return true
}

/**
 * Folds a ranked list (best first) into at most `limit` distinct designs with their close
 * variants. `view` says each item's group, family and parameters.
 */
export function distinctAnswers<T>(ranked: readonly T[], limit: number, view: (item: T) => Foldable): DistinctGroup<T>[] {
  const leads: { group: DistinctGroup<T>; view: Foldable }[] = []
  const byGroup = new Map<string, { group: DistinctGroup<T>; view: Foldable }[]>()
  for (const item of ranked) {
    const v = view(item)
    const same = byGroup.get(v.group) ?? []
    const near = same.find((l) => isCloseVariant(v.family, l.view.params, v.params))
    if (near) {
      near.group.variants.push(item)
      continue
    }
    const lead = { group: { lead: item, tier: (same.length === 0 ? 1 : 2) as 1 | 2, variants: [] }, view: v }
    same.push(lead)
    byGroup.set(v.group, same)
    leads.push(lead)
  }
  const ordered = [...leads.filter((l) => l.group.tier === 1), ...leads.filter((l) => l.group.tier === 2)]
  return ordered.slice(0, limit).map((l) => l.group)
}
