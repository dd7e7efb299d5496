/**
 * The cautions a data sheet shows: the general ones (every family) merged with the family's own
 * without saying anything twice. Each general caution makes one point (a topic); a family's
 * cautions make the same points in words fitted to the part, so a general caution whose every
 * topic a family caution already makes is left out, and the clause families add to send readers
 * to qualified review is dropped from them because the general caution on codes and review is
 * always shown.
 */

type CautionTopic = 'estimate' | 'creep' | 'fatigue' | 'review' | 'codes'

/** What makes a caution speak to a topic (the words the cautions use for it). */
const TOPIC_PATTERNS: Record<CautionTopic, RegExp> = {
  estimate: /\bconfirm\b[^.]*\bprinted parts\b/i,
  creep: /\bcreep/i,
  fatigue: /\bfatigue/i,
  review: /\bqualified (review|engineer)/i,
  codes: /\bcodes\b/i,
}

function topicsOf(text: string): Set<CautionTopic> {
  return new Set((Object.keys(TOPIC_PATTERNS) as CautionTopic[]).filter((t) => TOPIC_PATTERNS[t].test(text)))
}

/** Said on every data sheet, whatever the family (DESIGN.md: the usual cautions), one point each. */
export const GENERAL_CAUTIONS: readonly string[] = Object.freeze([
  'Predicted forces and positions are estimates from the named method for the nominal geometry: confirm them on printed parts before relying on them.',
  'Polymers creep under sustained load: a part held deflected loses force over time, faster when warm.',
  'Polymers fatigue under repeated load: a part cycled through its largest strain cracks sooner the higher that strain, so keep the strain safety factor well above 1 for parts that move often.',
  'Where a failure of the part could hurt someone, follow the applicable codes and standards and have the design reviewed by a qualified engineer.',
])

/** The family's clause sending readers to qualified review (the general caution says it with the codes). */
const REVIEW_CLAUSE = /,?\s*(and\s+)?defer to qualified review where a failure could hurt someone/i

function withoutReviewClause(text: string): string {
  const stripped = text.replace(REVIEW_CLAUSE, '').trim()
  return /[.!?]$/.test(stripped) ? stripped : `${stripped}.`
}

/**
 * General cautions first where the family does not make their point, then the family's, then
 * the caution on codes and review; exact repeats once.
 */
export function mergeCautions(general: readonly string[], family: readonly string[]): string[] {
  const own = family.map(withoutReviewClause).filter((c) => c.replace(/[.\s]/g, '').length > 0)
  const covered = new Set(own.flatMap((c) => [...topicsOf(c)]))
  const isReview = (c: string) => topicsOf(c).has('codes') || topicsOf(c).has('review')
  const kept = general.filter((g) => {
    const topics = [...topicsOf(g)]
    return isReview(g) || topics.length === 0 || !topics.every((t) => covered.has(t))
  })
  const out: string[] = []
  for (const c of [...kept.filter((g) => !isReview(g)), ...own, ...kept.filter(isReview)]) if (!out.includes(c)) out.push(c)
  return out
}
