/**
 * The 3MF, DXF and SVG files read back with general-purpose parsers, not with the writers'
 * own code: fflate (zip) and fast-xml-parser for the 3MF package, dxf-parser for the DXF,
 * fast-xml-parser for the SVG. Checked against the specifications they follow and against
 * the STL of the same part:
 * - 3MF Consortium, 3MF Core Specification 1.3: the OPC parts ([Content_Types].xml,
 *   _rels/.rels to /3D/3dmodel.model), unit="millimeter", a mesh whose every edge is shared by
 *   exactly two triangles and used once in each direction (§4.1.4 "manifold" meshes), and
 *   namespaced custom metadata names (§4.2).
 * - Autodesk DXF Reference: $INSUNITS 4 = millimetres; LWPOLYLINE flag 70 bit 1 = closed;
 *   group 39 = thickness (extrusion along Z).
 * - Volumes: the divergence theorem over the triangles (3MF) against the STL's; the DXF
 *   outline's shoelace area × depth against the same volume, and against the plan areas from
 *   the shapes' own formulas (tests/catalog/geometry/analytic.ts) within the faceting bound.
 */
import { describe, expect, it } from 'vitest'
import { strFromU8, unzipSync } from 'fflate'
import { XMLParser } from 'fast-xml-parser'
import DxfParser from 'dxf-parser'
import { buildGeometry, buildPartFile, serializeStl } from '../../../catalog'
import { checkStl } from '../../../catalog/geometry/mesh-check'
import { families } from '../../../catalog'
import { validateParams } from '../../../catalog/schema/validate'
import { analyticArea } from '../geometry/analytic'

const xml = new XMLParser({ ignoreAttributes: false, attributeNamePrefix: '', isArray: (name) => ['vertex', 'triangle', 'metadata', 'object', 'item', 'Default', 'Relationship', 'text'].includes(name) })

interface Read3mf {
  unit: string
  namespace: string
  objects: { name: string; type: string }[]
  items: number
  metadata: Record<string, string>
  vertices: [number, number, number][]
  triangles: [number, number, number][]
  contentTypes: string[]
  relTarget: string
}

function read3mf(bytes: Uint8Array): Read3mf {
  const files = unzipSync(bytes)
  expect(Object.keys(files).sort()).toEqual(['3D/3dmodel.model', '[Content_Types].xml', '_rels/.rels'])
  const types = xml.parse(strFromU8(files['[Content_Types].xml'])).Types.Default as { Extension: string; ContentType: string }[]
  const rels = xml.parse(strFromU8(files['_rels/.rels'])).Relationships.Relationship as { Target: string; Type: string }[]
  expect(rels[0].Type).toBe('http://schemas.microsoft.com/3dmanufacturing/2013/01/3dmodel')
  const model = xml.parse(strFromU8(files['3D/3dmodel.model'])).model
  const object = model.resources.object
  const mesh = object[0].mesh
  const metadata: Record<string, string> = {}
  for (const m of model.metadata as { name: string; '#text': string | number }[]) metadata[m.name] = String(m['#text'])
  return {
    unit: model.unit,
    namespace: model.xmlns,
    objects: object.map((o: { name: string; type: string }) => ({ name: String(o.name), type: o.type })),
    items: model.build.item.length,
    metadata,
    vertices: mesh.vertices.vertex.map((v: Record<string, string>) => [Number(v.x), Number(v.y), Number(v.z)]),
    triangles: mesh.triangles.triangle.map((t: Record<string, string>) => [Number(t.v1), Number(t.v2), Number(t.v3)]),
    contentTypes: types.map((t) => `${t.Extension}=${t.ContentType}`),
    relTarget: rels[0].Target,
  }
}

/** Undirected edges not in exactly two triangles; directed edges not used exactly once with their reverse. */
function edgeCheck(triangles: [number, number, number][]) {
  const undirected = new Map<string, number>()
  const directed = new Set<string>()
  let repeatedDirected = 0
  for (const t of triangles) {
    for (let k = 0; k < 3; k++) {
      const a = t[k], b = t[(k + 1) % 3]
      const u = a < b ? `${a}:${b}` : `${b}:${a}`
      undirected.set(u, (undirected.get(u) ?? 0) + 1)
      if (directed.has(`${a}>${b}`)) repeatedDirected++
      directed.add(`${a}>${b}`)
    }
  }
  let unpaired = 0
  for (const n of undirected.values()) if (n !== 2) unpaired++
  let unreversed = 0
  for (const d of directed) {
    const [a, b] = d.split('>')
    if (!directed.has(`${b}>${a}`)) unreversed++
  }
  return { unpaired, repeatedDirected, unreversed }
}

function volumeOf(vertices: [number, number, number][], triangles: [number, number, number][]): number {
  let sum = 0
  for (const [i, j, k] of triangles) {
    const a = vertices[i], b = vertices[j], c = vertices[k]
    sum += a[0] * (b[1] * c[2] - b[2] * c[1]) - a[1] * (b[0] * c[2] - b[2] * c[0]) + a[2] * (b[0] * c[1] - b[1] * c[0])
  }
  return sum / 6
}

const shoelace = (pts: { x: number; y: number }[]) => {
  let s = 0
  for (let i = 0; i < pts.length; i++) {
    const p = pts[i], q = pts[(i + 1) % pts.length]
    s += p.x * q.y - q.x * p.y
  }
  return s / 2
}

const meta = (name: string) => ({ name, entry: '17', revision: 3, material: 'petg' })

describe.each(families.map((f) => f.id))('part files of %s at its defaults', (familyId) => {
  const family = families.find((f) => f.id === familyId)!
  const params = validateParams(family, {}).params
  const stl = checkStl(serializeStl(buildGeometry(familyId, params)))
  const envelope = family.envelope(params)

  it('3MF: millimetres, one named object, a closed consistently oriented mesh of the STL\u2019s volume', () => {
    const read = read3mf(buildPartFile('3mf', familyId, params, meta('Demo "switch" & co')) as Uint8Array)
    expect(read.unit).toBe('millimeter')
    expect(read.namespace).toBe('http://schemas.microsoft.com/3dmanufacturing/core/2015/02')
    expect(read.contentTypes).toContain('model=application/vnd.ms-package.3dmanufacturing-3dmodel+xml')
    expect(read.relTarget).toBe('/3D/3dmodel.model')
    expect(read.objects).toEqual([{ name: 'Demo "switch" & co', type: 'model' }])
    expect(read.items).toBe(1)
    expect(read.metadata.Title).toBe('Demo "switch" & co')
    expect(read.metadata['flexshelf:entry']).toBe('17')
    expect(read.metadata['flexshelf:revision']).toBe('3')
    expect(read.metadata['flexshelf:material']).toBe('petg')
    for (const p of family.params) expect(read.metadata['flexshelf:parameters']).toContain(`${p.key}=${params[p.key]}`)
    // shared vertices: far fewer vertices than triangle corners, and each index in range
    expect(read.vertices.length).toBeLessThan(read.triangles.length * 3 / 2)
    expect(read.triangles.every((t) => t.every((i) => i >= 0 && i < read.vertices.length))).toBe(true)
    expect(edgeCheck(read.triangles)).toEqual({ unpaired: 0, repeatedDirected: 0, unreversed: 0 })
    expect(read.triangles.length).toBe(stl.triangleCount)
    const volume = volumeOf(read.vertices, read.triangles)
    // float32 STL against the 3MF's doubles: a few 1e-7 of the volume
    expect(Math.abs(volume - stl.volume) / stl.volume).toBeLessThan(1e-5)
    const zs = read.vertices.map((v) => v[2])
    expect(Math.max(...zs) - Math.min(...zs)).toBeCloseTo(envelope.z, 2)
  })

  it('DXF: closed outlines in millimetres whose area × depth is the solid\u2019s volume', () => {
    const text = buildPartFile('dxf', familyId, params, meta('Demo part')) as string
    const dxf = new DxfParser().parseSync(text)!
    expect(dxf.header.$INSUNITS).toBe(4)
    const polylines = dxf.entities.filter((e) => e.type === 'LWPOLYLINE') as unknown as { shape: boolean; depth?: number; vertices: { x: number; y: number }[] }[]
    expect(polylines.length).toBe(dxf.entities.length)
    expect(polylines.length).toBeGreaterThan(0)
    for (const p of polylines) {
      expect(p.shape).toBe(true)
      expect(p.depth).toBeCloseTo(envelope.z, 2)
    }
    expect(text).toContain(`Extrude ${Number(polylines[0].depth!.toFixed(3))} mm along +Z`)
    // outer loops run counter-clockwise and holes clockwise: the signed sum is the net area
    const area = polylines.reduce((s, p) => s + shoelace(p.vertices), 0)
    expect(polylines.filter((p) => shoelace(p.vertices) > 0).length).toBeGreaterThanOrEqual(1)
    expect(Math.abs(area * polylines[0].depth! - stl.volume) / stl.volume).toBeLessThan(1e-4)
    const exact = analyticArea[familyId](params)
    expect(Math.abs(area - exact.area)).toBeLessThanOrEqual(exact.facetBound + 1e-3 * exact.area)
    const xs = polylines.flatMap((p) => p.vertices.map((v) => v.x))
    const ys = polylines.flatMap((p) => p.vertices.map((v) => v.y))
    expect(Math.max(...xs) - Math.min(...xs)).toBeCloseTo(envelope.x, 2)
    expect(Math.max(...ys) - Math.min(...ys)).toBeCloseTo(envelope.y, 2)
  })

  it('SVG: the profile at 1 : 1 with its overall length and height written', () => {
    const text = buildPartFile('svg', familyId, params, meta('Demo <part>')) as string
    const svg = new XMLParser({ ignoreAttributes: false, attributeNamePrefix: '', isArray: (n) => n === 'text' }).parse(text).svg
    expect(svg.width).toMatch(/mm$/)
    const [, , vw, vh] = String(svg.viewBox).split(' ').map(Number)
    expect(parseFloat(svg.width)).toBeCloseTo(vw, 1)
    expect(parseFloat(svg.height)).toBeCloseTo(vh, 1)
    expect(svg.title).toBe('Demo <part> — profile, mm')
    const texts = svg.text as (string | { '#text': string; 'data-dimension'?: string })[]
    const dims = Object.fromEntries(texts.filter((t) => typeof t === 'object' && t['data-dimension']).map((t) => [(t as { 'data-dimension': string })['data-dimension'], Number((t as { '#text': string })['#text'])]))
    expect(dims.length).toBeCloseTo(envelope.x, 1)
    expect(dims.height).toBeCloseTo(envelope.y, 1)
    expect(texts.some((t) => typeof t === 'object' && String(t['#text']).startsWith(`Extrusion depth ${Number(envelope.z.toFixed(2))} mm`))).toBe(true)
  })
})

describe('part files', () => {
  it('give the same bytes for the same part (no time stamps)', () => {
    const a = buildPartFile('3mf', 'leaf-hinge', { length: 6 }, meta('Hinge'))
    const b = buildPartFile('3mf', 'leaf-hinge', { length: 6 }, meta('Hinge'))
    expect(Buffer.from(a as Uint8Array).equals(Buffer.from(b as Uint8Array))).toBe(true)
    expect(buildPartFile('dxf', 'leaf-hinge', { length: 6 }, meta('Hinge'))).toBe(buildPartFile('dxf', 'leaf-hinge', { length: 6 }, meta('Hinge')))
  })

  it('refuse parameters outside the family\u2019s schema, naming the field', () => {
    expect(() => buildPartFile('dxf', 'leaf-hinge', { length: -1 }, meta('Hinge'))).toThrow(/length/)
  })
})
