/**
 * The data sheet's cautions: the general list and the family's merged so that no point is made
 * twice and none is lost. Near-duplicates are judged here by the test's own measure (shared
 * content words, Jaccard index), not by the merge's topic rules.
 */
import { describe, expect, it } from 'vitest'
import { families } from '../../catalog'
import { GENERAL_CAUTIONS, mergeCautions } from '../../api/services/cautions'

const STOP = new Set('a an the and or of to in on for from with by at as is are be it its their this that these than so under over far when where which may can should not do any'.split(' '))
const words = (s: string) => new Set(s.toLowerCase().replace(/[^a-z\s]/g, ' ').split(/\s+/).filter((w) => w.length > 2 && !STOP.has(w)))
function jaccard(a: string, b: string): number {
  const x = words(a), y = words(b)
  const shared = [...x].filter((w) => y.has(w)).length
  return shared / (x.size + y.size - shared)
}
/** Sentences (a caution of two sentences may repeat another's first). */
const sentences = (list: string[]) => list.flatMap((c) => c.split(/(?<=[.;:])\s+/).filter((s) => s.length > 25))

// the usual cautions every sheet must carry (DESIGN.md; common practice for printed flexures)
const POINTS: Array<[string, RegExp]> = [
  ['confirm on printed parts', /confirm[^.]*printed parts/i],
  ['creep', /creep/i],
  ['fatigue', /fatigue/i],
  ['codes and qualified review', /codes and standards[^.]*qualified engineer/i],
]

describe('the data sheet\u2019s cautions', () => {
  it('repeat neither a point nor a phrase for any family: no two sentences share half their words, and each point is made once', () => {
    for (const family of families) {
      const merged = mergeCautions(GENERAL_CAUTIONS, family.cautions)
      expect(new Set(merged).size, family.id).toBe(merged.length)
      const all = sentences(merged)
      for (let i = 0; i < all.length; i++) {
        for (let j = i + 1; j < all.length; j++) expect(jaccard(all[i], all[j]), `${family.id}: "${all[i]}" / "${all[j]}"`).toBeLessThan(0.5)
      }
      for (const [point, pattern] of POINTS) {
        expect(merged.filter((c) => pattern.test(c)).length, `${family.id}: ${point}`).toBe(1)
      }
      expect(merged.filter((c) => /qualified review/i.test(c)), family.id).toEqual([])
    }
  })

  it('keeps every family caution\u2019s own content', () => {
    for (const family of families) {
      const merged = mergeCautions(GENERAL_CAUTIONS, family.cautions).join(' ')
      for (const c of family.cautions) expect(merged, family.id).toContain(c.split(/[;,.]/)[0])
    }
  })

  it('merges a worked case as expected: the family\u2019s creep point replaces the general one, the review clause goes to the codes caution', () => {
    const general = ['Polymers creep under load.', 'Polymers fatigue under repeated load.', 'Where a failure could hurt someone, follow the applicable codes and standards and have it reviewed by a qualified engineer.']
    const family = ['A latch held shut creeps and loses force. Confirm on printed parts, and defer to qualified review where a failure could hurt someone.']
    expect(mergeCautions(general, family)).toEqual([
      'Polymers fatigue under repeated load.',
      'A latch held shut creeps and loses force. Confirm on printed parts.',
      general[2],
    ])
  })
})
