import { mkdtempSync, readFileSync, writeFileSync } from 'node:fs'
import { tmpdir } from 'node:os'
import { join } from 'node:path'
import { describe, expect, it } from 'vitest'
import { unzipSync, strFromU8 } from 'fflate'
import DxfParser from 'dxf-parser'
import { runCli as run } from '../cli-runner'


const dir = mkdtempSync(join(tmpdir(), 'flexshelf-files-'))

describe('flexshelf 3mf|dxf|svg', () => {
  it('writes a 3MF package named after the object', async () => {
    const file = join(dir, 'hinge.3mf')
    const observed = await run(['3mf', 'leaf-hinge', '{"length":6}', '-o', file, '--name', 'Lid hinge'])
    expect(observed.code).toBe(0)
    expect(observed.err).toMatch(/^wrote .*hinge\.3mf \(\d+ bytes\)/)
    const model = strFromU8(unzipSync(new Uint8Array(readFileSync(file)))['3D/3dmodel.model'])
    expect(model).toContain('unit="millimeter"')
    expect(model).toContain('name="Lid hinge"')
  })

  it('writes a DXF a DXF reader opens, and an SVG', async () => {
    const dxf = join(dir, 'switch.dxf')
    expect((await run(['dxf', 'bistable-beam', '{"span":40}', '-o', dxf])).code).toBe(0)
    const parsed = new DxfParser().parseSync(readFileSync(dxf, 'utf8'))!
    expect(parsed.header.$INSUNITS).toBe(4)
    expect(parsed.entities.length).toBeGreaterThan(0)
    const svg = join(dir, 'switch.svg')
    expect((await run(['svg', 'bistable-beam', '{"span":40}', '-o', svg])).code).toBe(0)
    expect(readFileSync(svg, 'utf8')).toMatch(/^<\?xml[^]*<svg [^]*<\/svg>\n$/)
  })

  it('names the bad field and exits 1, writing nothing', async () => {
    const file = join(dir, 'bad.dxf')
    const observed = await run(['dxf', 'leaf-hinge', '{"length":-4}', '-o', file])
    expect(observed.code).toBe(1)
    expect(observed.err).toMatch(/^length: /)
    expect(() => readFileSync(file)).toThrow()
    expect((await run(['3mf', 'leaf-hinge', '{}'])).err).toMatch(/3mf needs an output file: -o part\.3mf/)
  })
})

describe('flexshelf search --shelf', () => {
  it('says which range of which entry is not a [min, max] pair instead of searching with NaN', async () => {
    const file = join(dir, 'objects.json')
    writeFileSync(file, JSON.stringify({ entries: [{ familyId: 'leaf-hinge', name: 'Lid hinge', materials: ['petg'], ranges: { length: { min: 4, max: 12 } } }] }))
    const observed = await run(['search', '{"kind":"hinge","stiffness":{"max":10}}', '--shelf', file])
    expect(observed.code).toBe(1)
    expect(observed.out).toBe('')
    expect(observed.err).toContain('entry 0 ("Lid hinge") ranges.length must be a [min, max] pair of numbers with min ≤ max, got {"min":4,"max":12}')
    expect(observed.err).not.toMatch(/NaN/)
  })
})
