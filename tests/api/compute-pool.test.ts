/**
 * The compute pool (api/services/compute-pool.ts): on worker threads, an evaluation, a
 * tolerance band and an STL are exactly what the catalog gives in this thread, and the
 * core's errors come back as the same classes with the same fields, so the error handler
 * answers 400/404/422 as before. Without threads the same calls run in this thread.
 */
import { afterAll, beforeAll, describe, expect, it } from 'vitest'
import { buildGeometry, evaluate, serializeStl, SolverError, UnknownFamilyError, ValidationError } from '../../catalog'
import { toleranceBand } from '../../catalog/tolerance'
import { compute, computeThreads, configureComputePool } from '../../api/services/compute-pool'
import { fromFailure, toFailure } from '../../api/services/compute/tasks'

async function failure(run: () => Promise<unknown>): Promise<unknown> {
  try {
    await run()
  } catch (err) {
    return err
  }
  throw new Error('expected a failure')
}

describe('the compute pool with one worker thread', () => {
  beforeAll(() => configureComputePool({ threads: 1 }))
  afterAll(() => configureComputePool({ threads: 0 }))

  it('runs on a thread of its own', () => {
    expect(computeThreads()).toBe(1)
  })

  it('evaluates exactly as the catalog does in this thread (leaf hinge, nonlinear-fe)', async () => {
    const expected = evaluate('leaf-hinge', { length: 8 }, { method: 'nonlinear-fe' })
    expect(await compute.evaluate('leaf-hinge', { length: 8 }, { method: 'nonlinear-fe' })).toEqual(expected)
  })

  it('computes the same tolerance band and the same STL bytes, many at once', async () => {
    const band = toleranceBand('snap-hook', { length: 14 }, { tolerance: { thickness: 0.05, modulus: 0.1 } })
    const stl = serializeStl(buildGeometry('serpentine-spring', {}))
    const [observedBand, ...observedStl] = await Promise.all([
      compute.toleranceBand('snap-hook', { length: 14 }, { tolerance: { thickness: 0.05, modulus: 0.1 } }),
      ...Array.from({ length: 4 }, () => compute.stl('serpentine-spring', {})),
    ])
    expect(observedBand).toEqual(band)
    for (const bytes of observedStl) expect(Buffer.from(bytes).equals(Buffer.from(stl))).toBe(true)
  })

  it('gives back a ValidationError with its issues, an UnknownFamilyError and a SolverError', async () => {
    const invalid = await failure(() => compute.evaluate('leaf-hinge', { length: -1, speed: 3 }))
    expect(invalid).toBeInstanceOf(ValidationError)
    expect((invalid as ValidationError).issues.map((i) => i.field).sort()).toEqual(['length', 'speed'])
    const unknown = await failure(() => compute.stl('no-such-family', {}))
    expect(unknown).toBeInstanceOf(UnknownFamilyError)
    expect((unknown as UnknownFamilyError).familyId).toBe('no-such-family')
    // no valid input makes the solver fail any more (the denormal side post the fuzz found is now
    // refused by the schema), so the SolverError is checked on the record a pool thread sends back
    const solver = fromFailure(structuredClone(toFailure(new SolverError('no convergence at step 3', { step: 3, residual: 0.5 }))))
    expect(solver).toBeInstanceOf(SolverError)
    expect((solver as SolverError).details).toEqual({ step: 3, residual: 0.5 })
    const tinyPost = await failure(() => compute.evaluate('bistable-beam', { postLength: 1e-300 }, { method: 'nonlinear-fe' }))
    expect((tinyPost as ValidationError).issues.map((i) => i.field)).toEqual(['postLength'])
  })
})

describe('the compute pool without threads', () => {
  it('runs the same calls in this thread', async () => {
    await configureComputePool({ threads: 0 })
    expect(computeThreads()).toBe(0)
    expect(await compute.evaluate('notch-hinge', {})).toEqual(evaluate('notch-hinge', {}))
    expect(await failure(() => compute.evaluate('notch-hinge', { radius: 'big' }))).toBeInstanceOf(ValidationError)
  })
})

describe('bcrypt on the compute pool', () => {
  beforeAll(() => configureComputePool({ threads: 1 }))
  afterAll(() => configureComputePool({ threads: 0 }))

  it('hashes at the cost asked for, and compares right and wrong passwords', async () => {
    const hash = await compute.hashPassword('correct horse battery', 10)
    expect(hash).toMatch(/^\$2[aby]\$10\$/)
    expect(await compute.comparePassword('correct horse battery', hash)).toBe(true)
    expect(await compute.comparePassword('wrong horse battery', hash)).toBe(false)
  })
})
