/**
 * 3MF package of one solid, written to the 3MF Consortium's core specification (1.3): an OPC
 * zip with [Content_Types].xml, _rels/.rels and 3D/3dmodel.model; unit millimetre; one object
 * of type "model" whose mesh lists each vertex once and each triangle by vertex index.
 *
 * Not @jscad/3mf-serializer: it writes every polygon's corners as new vertices (no triangle
 * shares a vertex index with its neighbour, so a reader sees a mesh of loose triangles, not a
 * closed one) and stamps the creation time, so the same part would not give the same bytes.
 * The zip is fflate's, with a fixed file time for the same reason.
 */
import { strToU8, zipSync } from 'fflate'
import { indexedMesh } from './mesh'

const CORE_NAMESPACE = 'http://schemas.microsoft.com/3dmanufacturing/core/2015/02'
/** Namespace of Flexshelf's own metadata names (the core allows only namespaced custom names). */
const FLEXSHELF_NAMESPACE = 'urn:flexshelf:3mf:metadata:1'
const MODEL_TYPE = 'http://schemas.microsoft.com/3dmanufacturing/2013/01/3dmodel'
/** Zip entries carry this time, so the bytes depend on the part alone. */
const FIXED_TIME = new Date('2020-01-01T00:00:00Z')

export interface PartMetadata {
  /** Object and title name: the entry's name. */
  name: string
  family: string
  entry?: string
  revision?: number | string
  material?: string
  params: Record<string, number | string>
}

export function escapeXml(text: string): string {
  return text.replace(/[&<>"']/g, (c) => ({ '&': '&amp;', '<': '&lt;', '>': '&gt;', '"': '&quot;', "'": '&apos;' })[c]!)
    // characters XML 1.0 cannot hold at all
    .replace(/[\u0000-\u0008\u000b\u000c\u000e-\u001f\ufffe\uffff]/g, '')
}

/** "span 40 mm, depth 5 mm" style: the parameters as the file's metadata states them. */
export function parameterText(params: Record<string, number | string>): string {
  return Object.entries(params).filter(([k]) => k !== 'material').map(([k, v]) => `${k}=${v}`).join('; ')
}

function modelXml(solid: unknown, meta: PartMetadata): string {
  const { vertices, triangles } = indexedMesh(solid)
  const metadata: [string, string][] = [
    ['Title', meta.name],
    ['Application', 'Flexshelf'],
    ['Description', `${meta.family} module; estimates to be confirmed on printed parts`],
    ['flexshelf:family', meta.family],
  ]
  if (meta.entry !== undefined) metadata.push(['flexshelf:entry', meta.entry])
  if (meta.revision !== undefined) metadata.push(['flexshelf:revision', String(meta.revision)])
  if (meta.material !== undefined) metadata.push(['flexshelf:material', meta.material])
  metadata.push(['flexshelf:parameters', parameterText(meta.params)])
  const out: string[] = [
    '<?xml version="1.0" encoding="UTF-8"?>',
    `<model unit="millimeter" xml:lang="en-US" xmlns="${CORE_NAMESPACE}" xmlns:flexshelf="${FLEXSHELF_NAMESPACE}">`,
  ]
  for (const [name, value] of metadata) out.push(`  <metadata name="${name}">${escapeXml(value)}</metadata>`)
  out.push('  <resources>', `    <object id="1" type="model" name="${escapeXml(meta.name)}">`, '      <mesh>', '        <vertices>')
  for (let i = 0; i < vertices.length; i += 3) out.push(`          <vertex x="${vertices[i]}" y="${vertices[i + 1]}" z="${vertices[i + 2]}"/>`)
  out.push('        </vertices>', '        <triangles>')
  for (let i = 0; i < triangles.length; i += 3) out.push(`          <triangle v1="${triangles[i]}" v2="${triangles[i + 1]}" v3="${triangles[i + 2]}"/>`)
  out.push('        </triangles>', '      </mesh>', '    </object>', '  </resources>', '  <build>', '    <item objectid="1"/>', '  </build>', '</model>', '')
  return out.join('\n')
}

const CONTENT_TYPES = `<?xml version="1.0" encoding="UTF-8"?>
<Types xmlns="http://schemas.openxmlformats.org/package/2006/content-types">
  <Default Extension="rels" ContentType="application/vnd.openxmlformats-package.relationships+xml"/>
  <Default Extension="model" ContentType="application/vnd.ms-package.3dmanufacturing-3dmodel+xml"/>
</Types>
`

const RELATIONSHIPS = `<?xml version="1.0" encoding="UTF-8"?>
<Relationships xmlns="http://schemas.openxmlformats.org/package/2006/relationships">
  <Relationship Target="/3D/3dmodel.model" Id="rel0" Type="${MODEL_TYPE}"/>
</Relationships>
`

/** The .3mf bytes of a solid (mm); the same solid and metadata give the same bytes. */
export function serialize3mf(solid: unknown, meta: PartMetadata): Uint8Array {
  return zipSync({
    '[Content_Types].xml': strToU8(CONTENT_TYPES),
    // flat paths: no folder entries, only the three parts OPC names
    '_rels/.rels': strToU8(RELATIONSHIPS),
    '3D/3dmodel.model': strToU8(modelXml(solid, meta)),
  }, { level: 3, mtime: FIXED_TIME })
}
