import { describe, expect, it } from 'vitest'
import { SolverError } from '../../../catalog/errors'
import { firstCrossing, indicesUpTo, sampleAt, strainLimitedStop } from '../../../catalog/solvers'
import type { PathResult } from '../../../catalog/solvers'

const path = (control: number[], maxStrain: number[]): PathResult => ({
  control, reaction: control.map((c) => 2 * c), maxStrain, tracked: [], iterations: 0,
  stable: control.map(() => true), extrema: [], steps: control.length, jumps: [], stabilityLoss: [],
})

describe('path sampling', () => {
  it('finds the fractional index where a rising series first reaches a level', () => {
    expect(firstCrossing([0, 1, 2, 3], 2.5)).toBeCloseTo(2.5, 12)
    expect(firstCrossing([0, 1, 2], 5)).toBeNull()
  })

  it('interpolates linearly at a fractional index, the last interval included', () => {
    expect(sampleAt([0, 10, 30], 1.5)).toBeCloseTo(20, 12)
    expect(sampleAt([0, 10, 30], 2)).toBe(30)
  })

  it('keeps the points at or below an end value', () => {
    expect(indicesUpTo([0, 0.5, 1, 1.5], 1)).toEqual([0, 1, 2])
  })

  it('stops at the strain limit when the path reaches it', () => {
    const observed = strainLimitedStop(path([0, 1, 2, 3], [0, 0.01, 0.02, 0.03]), 0.015, 3, 'test')
    expect(observed).toEqual({ at: 1.5, strainGoverned: true })
  })

  it('stops at the working-range cap when the limit is not reached', () => {
    expect(strainLimitedStop(path([0, 1, 2, 3], [0, 0.001, 0.002, 0.003]), 0.015, 3, 'test')).toEqual({ at: 3, strainGoverned: false })
  })

  it('refuses a path that ended short of both', () => {
    expect(() => strainLimitedStop(path([0, 1, 2], [0, 0.001, 0.002]), 0.015, 3, 'test')).toThrow(SolverError)
  })
})
