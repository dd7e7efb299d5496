/**
 * Fuzz of the force-window parser (the input of every search): 2000 cases, a third
 * well-formed, the rest with one planted fault. A well-formed window parses to itself; a
 * fault is refused with a ValidationError naming its field path ("peakForce.min").
 */
import fc from 'fast-check'
import { describe, expect, it } from 'vitest'
import { parseWindow } from '../../../catalog/index'
import { describeError, expectRefusedNaming } from './arbitraries'
import { windowCases } from './windows'

const RUNS = 2000

describe('parseWindow under fuzzed windows', () => {
  it(`accepts every well-formed window and names the field of every fault, over ${RUNS} cases`, () => {
    let accepted = 0
    fc.assert(
      fc.property(windowCases(33), (c) => {
        let parsed: unknown
        let error: unknown
        try {
          parsed = parseWindow(c.window)
        } catch (e) {
          error = e
        }
        if (c.tag === 'valid') {
          if (error !== undefined) throw new Error(`a well-formed window was refused: ${describeError(error)}\n${JSON.stringify(c.window)}`)
          expect(parsed).toEqual(c.window)
          accepted++
          return
        }
        if (error === undefined) throw new Error(`a window with a fault in ${c.field} was accepted: ${JSON.stringify(c.window)}`)
        expectRefusedNaming(error, c.field)
      }),
      { numRuns: RUNS, seed: 8_2028 },
    )
    expect(accepted).toBeGreaterThan(RUNS / 5)
  })
})
