/**
 * The trade-off points of a search answer, for the scatter beside the results table: every
 * candidate the answer kept (the listed results and the close variants folded under them),
 * each with its margin, strain safety and footprint, so the screen can plot margin against
 * either. The number of points is capped so a wide search cannot send an unbounded answer;
 * the answer says how many there were and whether it was cut.
 */
import { findFamily, type SearchAnswer } from '../../../catalog'

/** Points sent at most; listed results always come first, then the best close variants. */
export const MAX_TRADEOFF_POINTS = 400

interface TradeoffPoint {
  entryId: string | number
  entryName: string
  family: string
  params: Record<string, number | string>
  /** Margin to the window's edges over the tolerance band (fraction of the window). */
  margin: number
  /** Strain safety factor at the band's worst corner; null when the family reports no strain. */
  safetyFactor: number | null
  /** Envelope area in the build plane, mm² (the ranking's footprint). */
  footprint: number | null
  /** 1-based position in the results when listed; null for a close variant. */
  position: number | null
  /** For a close variant, the position of the listed result it folds under. */
  variantOf: number | null
}

export interface Tradeoffs {
  points: TradeoffPoint[]
  /** Candidates the answer kept, before the cap. */
  total: number
  capped: boolean
}

function footprintOf(familyId: string, params: Record<string, number | string>): number | null {
  const family = findFamily(familyId)
  if (!family) return null
  const numeric: Record<string, number> = {}
  for (const [k, v] of Object.entries(params)) if (typeof v === 'number') numeric[k] = v
  try {
    const env = family.envelope(numeric)
    const area = env.x * env.y
    return Number.isFinite(area) ? area : null
  } catch {
    return null
  }
}

export function tradeoffsOf(answer: Pick<SearchAnswer, 'results'>, cap = MAX_TRADEOFF_POINTS): Tradeoffs {
  const listed: TradeoffPoint[] = answer.results.map((r, i) => ({
    entryId: r.entryId, entryName: r.entryName, family: r.family, params: r.params,
    margin: r.margin, safetyFactor: r.safetyFactor,
    footprint: r.rank?.footprint ?? footprintOf(r.family, r.params),
    position: i + 1, variantOf: null,
  }))
  const variants = answer.results.flatMap((r, i) => (r.closeVariants ?? []).map((v) => ({ result: r, position: i + 1, variant: v })))
  const total = listed.length + variants.length
  // the best variants by margin, then strain safety, fill what the cap leaves
  variants.sort((a, b) => b.variant.margin - a.variant.margin || (b.variant.safetyFactor ?? Infinity) - (a.variant.safetyFactor ?? Infinity))
  const room = Math.max(0, cap - listed.length)
  const points = listed.slice(0, cap)
  for (const { result, position, variant } of variants.slice(0, room)) {
    points.push({
      entryId: result.entryId, entryName: result.entryName, family: result.family, params: variant.params,
      margin: variant.margin, safetyFactor: variant.safetyFactor, footprint: footprintOf(result.family, variant.params),
      position: null, variantOf: position,
    })
  }
  return { points, total, capped: points.length < total }
}
