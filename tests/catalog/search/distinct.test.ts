/**
 * Distinct answers and a readable ranking. Judged on the answers themselves (parameters,
 * margins, the stated sort key), not on the folding code's own bookkeeping.
 */
import { describe, expect, it } from 'vitest'
import { getFamily } from '../../../catalog'
import { DEMO_SHELF, searchShelfSync } from '../../../catalog/search'
import { distinctAnswers, isCloseVariant } from '../../../catalog/search/distinct'
import type { SearchResult } from '../../../catalog/search/types'

const hinge = getFamily('leaf-hinge')

/** Within 3 % on every numeric parameter (the test of "the same design"). */
function within3Percent(a: Record<string, number | string>, b: Record<string, number | string>): boolean {
  return Object.keys(a).every((k) => typeof a[k] !== 'number' || Math.abs((a[k] as number) - (b[k] as number)) <= 0.03 * Math.max(Math.abs(a[k] as number), Math.abs(b[k] as number)))
}

const sentences = (text: string) => text.split(/(?<=[.;])\s+(?=[A-Z#])/).map((s) => s.trim()).filter(Boolean)

/** Every consecutive pair in the order the stated key says. */
function expectInKeyOrder(results: SearchResult[]) {
  for (let i = 1; i < results.length; i++) {
    const a = results[i - 1].rank!, b = results[i].rank!
    const cmp = [
      a.tier - b.tier,
      b.marginBand[0] - a.marginBand[0],
      (b.safetyBand?.[0] ?? Infinity) === (a.safetyBand?.[0] ?? Infinity) ? 0 : (b.safetyBand?.[0] ?? Infinity) > (a.safetyBand?.[0] ?? Infinity) ? 1 : -1,
      a.footprint - b.footprint,
      a.volume - b.volume,
    ].find((d) => d !== 0) ?? 0
    expect(cmp, `row ${i} against row ${i + 1}`).toBeLessThanOrEqual(0)
  }
}

describe('isCloseVariant', () => {
  it('calls half a step or 2 % close and more than a step and 3 % distinct', () => {
    const base = { length: 4, thickness: 0.6, depth: 20, linkLength: 25 }
    expect(isCloseVariant(hinge, base, { ...base, depth: 20.4 })).toBe(true)
    expect(isCloseVariant(hinge, base, { ...base, linkLength: 25.5 })).toBe(true)
    expect(isCloseVariant(hinge, base, { ...base, linkLength: 28 })).toBe(false)
    expect(isCloseVariant(hinge, base, { ...base, depth: 24, linkLength: 25.5 })).toBe(false)
  })
})

describe('distinctAnswers', () => {
  it('lists the best of each group first, folds close variants under the design they are close to', () => {
    const mk = (group: string, linkLength: number) => ({ group, family: hinge, params: { length: 4, thickness: 0.6, depth: 20, linkLength } })
    const ranked = [mk('A', 25), mk('A', 25.5), mk('A', 32), mk('B', 25), mk('A', 24.8), mk('A', 31.5)]
    const groups = distinctAnswers(ranked, 10, (x) => x)
    expect(groups.map((g) => [g.lead.group, g.lead.params.linkLength, g.tier, g.variants.map((v) => v.params.linkLength)])).toEqual([
      ['A', 25, 1, [25.5, 24.8]],
      ['B', 25, 1, []],
      ['A', 32, 2, [31.5]],
    ])
    expect(distinctAnswers(ranked, 2, (x) => x).map((g) => g.lead.group)).toEqual(['A', 'B'])
  })
})

describe('search answers are distinct and their order can be read', () => {
  const windows: Record<string, unknown> = {
    'power switch for a gloved thumb': { kind: 'bistable', peakForce: { min: 4, max: 8 }, holdingForce: { min: 0.8 } },
    'hinge, stiffness and rotation': { kind: 'hinge', rotationalStiffness: { min: 5, max: 400 }, rotation: { min: 10 } },
    'hinge on a 0.6 mm nozzle (one entry unprintable in two materials)': { kind: 'hinge', rotationalStiffness: { min: 20, max: 2000 }, printer: { nozzle: 0.6, layer: 0.3 } },
    'return spring': { kind: 'spring', stiffness: { min: 0.2, max: 0.6 } },
  }
  for (const [name, window] of Object.entries(windows)) {
    it(name, () => {
      const answer = searchShelfSync(window, DEMO_SHELF, { confirm: 0 })
      const results = answer.results
      expect(results.length).toBeGreaterThan(0)
      // the top five: never two of one entry and material within 3 % on every parameter
      const top = results.slice(0, 5)
      for (let i = 0; i < top.length; i++) for (let j = i + 1; j < top.length; j++) {
        const same = top[i].entryId === top[j].entryId && top[i].params.material === top[j].params.material
        if (same) expect(within3Percent(top[i].params, top[j].params), `#${i + 1} and #${j + 1}`).toBe(false)
      }
      // one group per entry and material before any second design of one
      const tiers = results.map((r) => r.rank!.tier)
      expect(tiers).toEqual([...tiers].sort())
      const firstTier = results.filter((r) => r.rank!.tier === 1).map((r) => `${r.entryId}|${r.params.material}`)
      expect(new Set(firstTier).size).toBe(firstTier.length)
      // the shown key holds the shown numbers, and the rows are in its order
      for (const r of results) {
        expect(r.margin).toBeGreaterThanOrEqual(r.rank!.marginBand[0] - 1e-9)
        expect(r.margin).toBeLessThan(r.rank!.marginBand[1] + 1e-9)
        if (r.rank!.safetyBand && r.safetyFactor !== null) {
          expect(r.safetyFactor).toBeGreaterThanOrEqual(r.rank!.safetyBand[0] - 1e-6)
          expect(r.safetyFactor).toBeLessThan(r.rank!.safetyBand[1] + 1e-6)
        }
        for (const v of r.closeVariants!) {
          expect(v.params.material).toBe(r.params.material)
          expect(isCloseVariant(getFamily(r.family), r.params as Record<string, number>, v.params as Record<string, number>)).toBe(true)
        }
      }
      expectInKeyOrder(results)
      // no sentence said twice
      const said = sentences(answer.explanation)
      expect(new Set(said).size, answer.explanation).toBe(said.length)
    })
  }

  it('the gloved-thumb switch: more than one entry–material on the first page, with close variants folded', () => {
    const answer = searchShelfSync(windows['power switch for a gloved thumb'], DEMO_SHELF, { confirm: 0 })
    const plain = searchShelfSync(windows['power switch for a gloved thumb'], DEMO_SHELF, { confirm: 0, distinct: false })
    const groups = (rs: SearchResult[]) => new Set(rs.slice(0, 10).map((r) => `${r.entryId}|${r.params.material}`)).size
    expect(groups(answer.results)).toBeGreaterThanOrEqual(groups(plain.results))
    expect(answer.results.reduce((n, r) => n + r.closeVariants!.length, 0)).toBeGreaterThan(0)
    expect(answer.explanation).toMatch(/\d+ close variants? \(within a step or 3 % on every parameter\) fold under them\./)
  })
})
