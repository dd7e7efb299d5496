import { describe, expect, it } from 'vitest'
import { evaluate, ValidationError } from '../../../catalog/index'

describe('bistable-beam ratio rule on its boundary', () => {
  it('accepts apexHeight = 1.5 × thickness despite floating-point rounding (0.3 / 0.2)', () => {
    expect(() => evaluate('bistable-beam', { span: 20, apexHeight: 0.3, thickness: 0.2, depth: 5 }, { method: 'closed-form' })).not.toThrow()
  })
})

describe('bistable-beam side posts too short to print', () => {
  it('refuses a post between 0 and 0.1 mm, naming postLength (found by the evaluate fuzz)', () => {
    let issues: Array<{ field: string }> = []
    try {
      evaluate('bistable-beam', { postLength: 1e-300 })
    } catch (e) {
      if (e instanceof ValidationError) issues = e.issues
    }
    expect(issues.map((i) => i.field)).toEqual(['postLength'])
  })
})
