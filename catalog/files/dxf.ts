/**
 * DXF of the planar profile for CAD: closed LWPOLYLINE outlines in millimetres ($INSUNITS 4)
 * through @jscad/dxf-serializer. The extrusion depth is stated twice: as each polyline's
 * thickness (group code 39, the DXF way of saying "extruded this far along Z") and in a
 * comment line at the top that a person opening the file reads.
 */
import jscad from '@jscad/modeling'
import dxfSerializer from '@jscad/dxf-serializer'
import { profileOf } from './profile'
import type { PartMetadata } from './threemf'
import { parameterText } from './threemf'

const { geometries } = jscad

/** A DXF number as it is written: plain decimal, enough digits for a micrometre on any part. */
const dxfNumber = (v: number) => String(Number(v.toPrecision(10)))

/** DXF comment (group 999) text: one line, no control characters. */
const commentText = (text: string) => text.replace(/[\u0000-\u001f\u007f]/g, ' ')

export function serializeDxf(solid: unknown, meta: PartMetadata): string {
  const profile = profileOf(solid)
  // one path per loop, closed: the serializer writes each as a closed LWPOLYLINE as it is
  const paths = profile.loops.map((loop) => geometries.path2.fromPoints({ closed: true }, loop))
  const [text] = dxfSerializer.serialize({}, ...paths)
  // the polylines carry the solid's own height (the outline grid may move it by a few
  // 1e-4 mm), so area × thickness is the solid's volume; people read it to a micrometre
  const withThickness = text.replace(/(AcDbPolyline\n  90\n\d+\n  70\n1\n)/g, `$1  39\n${dxfNumber(profile.depth)}\n`)
  const depth = String(Number(profile.depth.toFixed(3)))
  const comments = [
    `Flexshelf profile of "${meta.name}" (${meta.family}), millimetres`,
    `Extrude ${depth} mm along +Z for the solid (the polylines' thickness says the same)`,
    `Parameters: ${parameterText(meta.params)}${meta.material ? `; material ${meta.material}` : ''}`,
    'Estimates to be confirmed on printed parts.',
  ]
  return withThickness.replace(/^999\nCreated by JSCAD\n/, comments.map((c) => `999\n${commentText(c)}\n`).join(''))
}
