/**
 * Parameter sets the geometry tests build: each family's defaults and corners of its ranges
 * (taken from the family's own schema, so they follow it), checked valid before use.
 */
import { families } from '../../../catalog/registry'
import type { FamilyDefinition, ParamSpec } from '../../../catalog/schema/types'
import { validateParams } from '../../../catalog/schema/validate'
import * as bistable from '../../../catalog/families/bistable-beam/geometry'
import * as leaf from '../../../catalog/families/leaf-hinge/geometry'
import * as notch from '../../../catalog/families/notch-hinge/geometry'
import * as guide from '../../../catalog/families/parallel-guide/geometry'
import * as serpentine from '../../../catalog/families/serpentine-spring/geometry'
import * as snap from '../../../catalog/families/snap-hook/geometry'
import type { Geom3 } from '@jscad/modeling/src/geometries/types'

export type Params = Record<string, number>

export interface GeometryModule {
  build: (p: Params) => Geom3
  envelope: (p: Params) => { x: number; y: number; z: number }
}

export const geometryOf: Record<string, GeometryModule> = {
  'bistable-beam': bistable,
  'leaf-hinge': leaf,
  'notch-hinge': notch,
  'parallel-guide': guide,
  'serpentine-spring': serpentine,
  'snap-hook': snap,
}

function familyDefinition(id: string): FamilyDefinition | undefined {
  return families.find((f) => f.id === id)
}

export function requireFamily(id: string): FamilyDefinition {
  const f = familyDefinition(id)
  if (!f) throw new Error(`family ${id} is not on the shelf`)
  return f
}

function spec(family: FamilyDefinition, key: string): ParamSpec {
  const s = family.params.find((p) => p.key === key)
  if (!s) throw new Error(`${family.id} has no parameter ${key}`)
  return s
}

/** Defaults with some keys at their range ends ('min' / 'max') or at given values. */
function corner(family: FamilyDefinition, picks: Record<string, 'min' | 'max' | number>): Params {
  const p: Params = {}
  for (const s of family.params) p[s.key] = s.default
  for (const [key, pick] of Object.entries(picks)) p[key] = typeof pick === 'number' ? pick : spec(family, key)[pick]
  // the schema's cross-field rules must hold, or the case is not a valid part
  return validateParams(family, p).params
}

const defaultsOf = (family: FamilyDefinition) => corner(family, {})

function familyCases(id: string): [string, Params][] {
  const f = familyDefinition(id)
  if (!f) throw new Error(`family ${id} is not on the shelf`)
  switch (id) {
    case 'bistable-beam':
      return [
        ['defaults', defaultsOf(f)],
        // apexHeight a little above its minimum: 0.3/0.2 falls a rounding error short of the 1.5 ratio rule
        ['range minimum', corner(f, { span: 'min', apexHeight: 0.35, thickness: 'min', depth: 'min', postLength: 'min' })],
        ['range maximum', corner(f, { span: 'max', apexHeight: 'max', thickness: 'max', depth: 'max', postLength: 'max' })],
        ['short posts, thick beams', corner(f, { span: 60, apexHeight: 4, thickness: 2, postLength: 0.5 })],
        ['side posts', corner(f, { postLength: Math.max(spec(f, 'postLength').default, 8) })],
      ]
    case 'leaf-hinge':
      return [
        ['defaults', defaultsOf(f)],
        ['range minimum', corner(f, { length: 'min', thickness: 'min', depth: 'min', linkLength: 'min' })],
        ['range maximum', corner(f, { length: 'max', thickness: 'max', depth: 'max', linkLength: 'max' })],
      ]
    case 'notch-hinge':
      return [
        ['defaults', defaultsOf(f)],
        ['range minimum (shallow notch)', corner(f, { radius: 'min', neckThickness: 'min', depth: 'min', blockThickness: 'min' })],
        ['range maximum (slotted notch)', corner(f, { radius: 'max', neckThickness: 'max', depth: 'max', blockThickness: 'max' })],
        ['semicircular notch, block = t + 2R', corner(f, { radius: 3, neckThickness: 0.8, blockThickness: 6.8 })],
      ]
    case 'parallel-guide':
      return [
        ['defaults', defaultsOf(f)],
        ['range minimum (one base hole)', corner(f, { length: 'min', thickness: 'min', depth: 'min', spacing: 'min' })],
        ['range maximum', corner(f, { length: 'max', thickness: 'max', depth: 'max', spacing: 'max' })],
      ]
    case 'serpentine-spring':
      return [
        ['defaults', defaultsOf(f)],
        ['range minimum', corner(f, { spans: 'min', spanLength: 'min', pitch: 'min', thickness: 'min', depth: 'min' })],
        ['range maximum', corner(f, { spans: 'max', spanLength: 'max', pitch: 'max', thickness: 'max', depth: 'max' })],
        ['even span count', corner(f, { spans: 4 })],
      ]
    case 'snap-hook':
      return [
        ['defaults', defaultsOf(f)],
        // shallowest angles the head still fits on a short arm
        ['range minimum', corner(f, { length: 'min', rootThickness: 'min', tipThickness: 'min', width: 'min', undercut: 'min', entryAngle: 30, retainAngle: 30, friction: 'min' })],
        ['range maximum, locking face', corner(f, { length: 'max', rootThickness: 'max', tipThickness: 'max', width: 'max', undercut: 'max', entryAngle: 'max', retainAngle: 'max', friction: 0.25 })],
      ]
    default:
      throw new Error(`no cases for ${id}`)
  }
}

export const familyIds = Object.keys(geometryOf)

export function casesOf(id: string): [string, Params][] {
  return familyCases(id)
}
