/**
 * Where the table's estimate cannot be trusted to decide a result: near the bistability limit
 * (the valley's sign is within the table's error of flipping — with side posts, near the post
 * length that removes bistability), where the second position approaches the end of travel,
 * where the path may fold back (a second snap), and where the energy barrier is small beside
 * the work to snap (its error relative to itself grows without bound as it vanishes). Search
 * judges such estimates with the exact solver; the table's validation counts flips separately
 * for marked and unmarked estimates, and must find no unmarked one.
 */
import { TABLE_METRICS } from './table-build'
import { interpolateTable, tableCoordinates } from './table'
import { bistableTable, type BistableTable } from './table-store'

/**
 * |valley|/peak below which the table's bistable flag may be wrong: the model's own "barely
 * bistable" threshold (common practice), above the largest flip the validation has measured
 * (its flagBand).
 */
const UNCERTAIN_VALLEY = 0.15
/** Energy barrier below this fraction of the work to snap: the barrier's own error is large. */
const UNCERTAIN_BARRIER = 0.15
/** Second stable position beyond this many apex heights: within 1.5 % of the travel of its end (2), where the table may put it on the other side. */
const UNCERTAIN_SECOND = 1.97

const slot = Object.fromEntries(TABLE_METRICS.map((k, i) => [k, i])) as Record<(typeof TABLE_METRICS)[number], number>
const scratch = new Float64Array(TABLE_METRICS.length)

export type UncertaintyReason = 'bistability limit' | 'post length limit' | 'end of travel' | 'second snap' | 'small barrier'

/**
 * Why the estimate at these parameters is uncertain (empty when it is not), or null outside
 * the table. Allocates only the returned list.
 */
export function tableUncertainty(p: { span: number; apexHeight: number; thickness: number; postLength: number }, table: BistableTable = bistableTable()): UncertaintyReason[] | null {
  const c = tableCoordinates(p.span, p.apexHeight, p.thickness, p.postLength)
  if (!interpolateTable(c.q, c.eta, c.w, scratch, table)) return null
  const reasons: UncertaintyReason[] = []
  const peak = scratch[slot.peak], valley = scratch[slot.valley]
  if (Math.abs(valley) < UNCERTAIN_VALLEY * Math.abs(peak)) reasons.push(p.postLength > 0 ? 'post length limit' : 'bistability limit')
  // the table stores 2 where the second position lies beyond the travel: deep in that region every node says 2
  const second = scratch[slot.secondAt]
  if (valley < 0 && second > UNCERTAIN_SECOND && second < 2 - 1e-6) reasons.push('end of travel')
  if (scratch[slot.fold] > 1e-3) reasons.push('second snap')
  if (valley < 0 && scratch[slot.barrier] < UNCERTAIN_BARRIER * scratch[slot.workIn]) reasons.push('small barrier')
  return reasons
}

/** Plain words for a reason, for search's explanations. */
export function uncertaintyText(reason: UncertaintyReason): string {
  switch (reason) {
    case 'bistability limit': return 'close to the bistability limit'
    case 'post length limit': return 'close to the side-post length that removes bistability'
    case 'end of travel': return 'the second position close to the end of travel'
    case 'second snap': return 'where the path may fold back (a second snap)'
    case 'small barrier': return 'a small energy barrier'
  }
}
