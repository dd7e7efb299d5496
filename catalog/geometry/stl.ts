import stlSerializer from '@jscad/stl-serializer'

/** Binary STL bytes of a JSCAD solid; deterministic for the same solid. */
export function serializeStl(solid: unknown): Uint8Array {
  const parts = stlSerializer.serialize({ binary: true }, solid) as ArrayBuffer[]
  const total = parts.reduce((n, p) => n + p.byteLength, 0)
  const out = new Uint8Array(total)
  let offset = 0
  for (const p of parts) {
    out.set(new Uint8Array(p), offset)
    offset += p.byteLength
  }
  return out
}
