import { mkdtempSync, writeFileSync } from 'node:fs'
import { tmpdir } from 'node:os'
import { join } from 'node:path'
import { describe, expect, it } from 'vitest'
import { runCli as run } from '../cli-runner'
import { DEMO_SHELF } from '../../../catalog/search'


describe('flexshelf search', () => {
  it('prints the answer as JSON over the built-in demo shelf', async () => {
    const observed = await run(['search', '{"kind":"spring","stiffness":{"min":0.2,"max":0.4},"limit":2}'])
    expect(observed.code).toBe(0)
    const answer = JSON.parse(observed.out)
    expect(Object.keys(answer).sort()).toEqual(['considered', 'dropped', 'elapsedMs', 'explanation', 'results'])
    expect(answer.results[0]).toMatchObject({ family: 'serpentine-spring', entryId: 'serpentine-spring/status-button-return-spring-gateway-g2' })
    for (const key of ['entryId', 'family', 'params', 'metrics', 'band', 'margin', 'confirmed', 'why']) expect(answer.results[0]).toHaveProperty(key)
  })

  it('reads a shelf file', async () => {
    const dir = mkdtempSync(join(tmpdir(), 'flexshelf-'))
    const file = join(dir, 'shelf.json')
    writeFileSync(file, JSON.stringify({ entries: DEMO_SHELF.filter((e) => e.familyId === 'snap-hook').map((e, i) => ({ ...e, id: 100 + i })) }))
    const observed = await run(['search', '{"kind":"latch","matingForce":{"max":30},"limit":3}', '--shelf', file])
    expect(observed.code).toBe(0)
    expect(JSON.parse(observed.out).results.every((r: { entryId: number }) => r.entryId >= 100)).toBe(true)
  })

  it('prints one line per bad field on stderr and exits 1', async () => {
    const observed = await run(['search', '{"kind":"bistable","peakForce":{"min":6,"max":5},"holdingForce":{"min":-1}}'])
    expect(observed.code).toBe(1)
    expect(observed.out).toBe('')
    expect(observed.err).toBe('peakForce.min: peakForce.min (6) must not be above peakForce.max (5)\nholdingForce.min: holdingForce.min must not be negative\n')
  })

  it('refuses a missing window and an unreadable shelf file', async () => {
    expect((await run(['search'])).err).toMatch(/search needs a force window as JSON/)
    expect((await run(['search', '{"kind":"guide"}', '--shelf', '/nonexistent/shelf.json'])).err).toMatch(/cannot read the shelf file/)
  })
})
