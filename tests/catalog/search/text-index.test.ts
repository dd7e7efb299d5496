import { describe, expect, it } from 'vitest'
import { families } from '../../../catalog'
import { createShelfIndex, DEMO_SHELF } from '../../../catalog/search'

const nameOf = (id: string | number) => DEMO_SHELF.find((e) => e.id === id)!.name

describe('ShelfTextIndex', () => {
  const index = createShelfIndex(DEMO_SHELF, families)

  it('finds entries by a word of the name, summary or tags', () => {
    expect(index.search('plunger').map((h) => nameOf(h.entryId))).toEqual(['Rain sensor plunger guide, weather mast W1'])
  })

  it('matches a prefix and a misspelling', () => {
    expect(index.search('plung').map((h) => nameOf(h.entryId))).toContain('Rain sensor plunger guide, weather mast W1')
    expect(index.search('batery').map((h) => nameOf(h.entryId))).toEqual(expect.arrayContaining(['Battery door hinge, field node shell S1', 'Battery door snap hook, field node shell S1']))
  })

  it('finds entries by family and by material', () => {
    expect(index.search('meander').map((h) => nameOf(h.entryId))).toEqual(['Status button return spring, gateway G2']) // family name words
    expect(index.search('pp').map((h) => nameOf(h.entryId))).toContain('Battery door hinge, field node shell S1')
  })

  it('ranks a name match above a summary-only match (field boosts)', () => {
    const hits = index.search('hinge')
    expect(nameOf(hits[0].entryId)).toBe('Battery door hinge, field node shell S1')
  })

  it('forgets entries when rebuilt without them', () => {
    const own = createShelfIndex(DEMO_SHELF, families)
    own.rebuild(DEMO_SHELF.filter((e) => e.familyId !== 'parallel-guide'))
    expect(own.search('plunger')).toEqual([])
    expect(own.size).toBe(DEMO_SHELF.length - 1)
    expect(own.search('   ')).toEqual([])
  })
})
