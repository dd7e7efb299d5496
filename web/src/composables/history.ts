/** Entry history: which two revisions are compared first, and their curves in one plot. */
import type { OverlayCurve } from './curveOverlay'

interface RevisionLike {
  id: number
  number: number
  curve: { displacement: readonly number[]; force: readonly number[] }
}

/** The revision before the current one against the current one (or the two newest when none is current). */
export function historyPair(revisions: readonly RevisionLike[], currentId: number | null): { a: number | null; b: number | null } {
  const sorted = [...revisions].sort((x, y) => x.number - y.number)
  if (sorted.length < 2) return { a: sorted[0]?.id ?? null, b: sorted[0]?.id ?? null }
  const currentIndex = sorted.findIndex((r) => r.id === currentId)
  const bIndex = currentIndex > 0 ? currentIndex : sorted.length - 1
  return { a: sorted[bIndex - 1].id, b: sorted[bIndex].id }
}

/** The older revision dashed under the newer one, whichever way round they were picked. */
export function historyCurves(a: RevisionLike | null, b: RevisionLike | null): OverlayCurve[] {
  if (!a || !b || a.id === b.id) return []
  const [older, newer] = a.number < b.number ? [a, b] : [b, a]
  return [
    { id: `rev-${older.id}`, label: `Revision ${older.number}`, role: 'before', curve: older.curve },
    { id: `rev-${newer.id}`, label: `Revision ${newer.number}`, role: 'after', curve: newer.curve },
  ]
}
