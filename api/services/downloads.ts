/**
 * Files an engineer takes away: the printable STL of a configuration and its predicted
 * curve as CSV. The same configuration always gives the same bytes.
 */
import Papa from 'papaparse'
import { PART_FORMATS, validateParams, type PartFormat } from '../../catalog'
import { compute } from './compute-pool'
import { FORMULA_START } from './csv-safety'
import type { ConfigurationInput } from './configuration-input'
import type { ToleranceBand } from '../../catalog/tolerance'
import { askedOf, evaluateTarget, type ConfigureTarget } from './configure'
import { downloadFileName } from './file-names'

export interface DownloadFile {
  fileName: string
  contentType: string
  body: Buffer | string
  /** Said in the Flexshelf-Notice header (retired entry, moved-on revision). */
  notices: string[]
}

/** Binary STL (serializeStl of buildGeometry) of the configured part, mm; built on the compute pool. */
export async function stlFile(target: ConfigureTarget, input: ConfigurationInput): Promise<DownloadFile> {
  const { family } = target
  // the ranges and materials were checked when the input was resolved; this fills in defaults
  const { params } = validateParams(family, input.params, { ranges: target.ranges, materials: target.materials })
  const bytes = await compute.stl(family.id, params, askedOf(target, input, 'the STL'))
  return {
    fileName: downloadFileName(target.entry.name, family, params, 'stl'),
    contentType: 'model/stl',
    body: Buffer.from(bytes.buffer, bytes.byteOffset, bytes.byteLength),
    notices: [...target.notices],
  }
}

/**
 * 3MF for slicers (mm, one object named after the entry, with entry, revision, parameters and
 * material as metadata), DXF of the planar profile for CAD (depth in the file and its name) or
 * SVG of the profile with its main dimensions; built on the compute pool.
 */
export async function partFile(format: PartFormat, target: ConfigureTarget, input: ConfigurationInput): Promise<DownloadFile> {
  const { family, entry } = target
  const { params, material } = validateParams(family, input.params, { ranges: target.ranges, materials: target.materials })
  const revision = entry.currentRevision?.number
  const body = await compute.partFile(format, family.id, params, {
    name: entry.name,
    entry: String(entry.id),
    ...(revision !== undefined ? { revision } : {}),
    material: material.id ? `${material.name} (${material.id})` : `${material.name}, modulus ${material.modulus} MPa`,
  })
  const { contentType, extension } = PART_FORMATS[format]
  const depth = family.envelope(params).z
  // a profile is only half the part without its depth: the DXF's and SVG's names carry it
  const suffix = format === '3mf' ? undefined : `profile-extrude${Number(depth.toPrecision(6))}mm`
  return {
    fileName: downloadFileName(entry.name, family, params, extension, suffix),
    contentType: format === '3mf' ? contentType : `${contentType}; charset=utf-8`,
    body: typeof body === 'string' ? body : Buffer.from(body.buffer, body.byteOffset, body.byteLength),
    notices: [...target.notices],
  }
}

const significant = (v: number) => Number(v.toPrecision(6))

function column(label: string, unit: string): string {
  return unit ? `${label} (${unit})` : label
}

/**
 * The predicted curve, one row per point: displacement and force named with their units
 * from curve.axes, the strain when the method reports it, and the force at the tolerance
 * band's low and high side when a tolerance is given. Text cells that a spreadsheet would
 * run as a formula (= + - @ tab CR and the full-width forms, csv-safety.ts) get a leading
 * apostrophe (papaparse escapeFormulae; numbers are written as numbers and never escaped).
 */
export async function curveCsvFile(target: ConfigureTarget, input: ConfigurationInput): Promise<DownloadFile> {
  return curveCsvOf(target, input, await evaluateTarget(target, input, 'the curve CSV'))
}

/** The CSV file of an evaluated band (the writer alone, so it can be checked on any curve). */
export function curveCsvOf(target: ConfigureTarget, input: ConfigurationInput, band: ToleranceBand): DownloadFile {
  const { curve } = band.nominal
  const { displacement: dAxis, force: fAxis } = curve.axes
  const fields = [column(dAxis.label, dAxis.unit), column(fAxis.label, fAxis.unit)]
  if (curve.strain) fields.push(column('Strain', 'fraction'))
  const withBand = input.tolerance !== null
  if (withBand) {
    const t = band.tolerance
    const at = `±${t.thickness} mm walls, ±${significant(t.modulus * 100)} % modulus`
    fields.push(column(`${fAxis.label}, tolerance low at ${at}`, fAxis.unit), column(`${fAxis.label}, tolerance high at ${at}`, fAxis.unit))
  }
  const rows = curve.displacement.map((d, i) => {
    const row: number[] = [significant(d), significant(curve.force[i])]
    if (curve.strain) row.push(significant(curve.strain[i]))
    if (withBand) row.push(significant(band.curve.low[i]), significant(band.curve.high[i]))
    return row
  })
  const csv = Papa.unparse({ fields, data: rows }, { escapeFormulae: FORMULA_START, newline: '\r\n' })
  return {
    fileName: downloadFileName(target.entry.name, target.family, band.nominal.params, 'csv', 'curve'),
    contentType: 'text/csv; charset=utf-8',
    body: `${csv}\r\n`,
    notices: [...target.notices],
  }
}
