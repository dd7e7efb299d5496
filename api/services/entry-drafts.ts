/**
 * What a contributor may write into a draft: the body schemas and the checks against the
 * module family (ranges inside the family's own, default parameters valid and inside the
 * ranges, materials on the shelf). Every problem names its field: `ranges.span`,
 * `defaultParams.thickness`, `materials.1`.
 */
import { z } from 'zod'
import { families, validateParams, ValidationError, type FamilyDefinition } from '../../catalog'
import type { ParamRanges, ParamValues } from '../db'
import { validationFailed, type FieldIssue } from '../errors'
import { bodySchema, optionalTextField, parseBody, plainText, textField } from '../validation'
import type { MaterialView } from './materials'

const optionalText = (field: string, max: number) => optionalTextField(field, max, { multiline: true })

const fields = {
  name: textField('name', 120),
  summary: optionalText('summary', 2000),
  tags: z.array(plainText(z.string({ error: 'each tag must be text' }).trim().min(1, 'a tag must not be empty').max(40, 'a tag must be at most 40 characters'), 'a tag'), { error: 'tags must be a list of words' })
    .max(20, 'at most 20 tags'),
  defaultParams: z.record(z.string(), z.unknown(), { error: 'defaultParams must be a JSON object of parameter values' }),
  ranges: z.record(z.string(), z.unknown(), { error: 'ranges must be a JSON object: { "<param>": [min, max] }' }),
  materials: z.array(z.string({ error: 'each material must be a material id' }), { error: 'materials must be a list of material ids' }).max(20, 'at most 20 materials'),
  notes: optionalText('notes', 5000),
}

const createBody = bodySchema({
  family: z.string({ error: (iss) => (iss.input === undefined ? 'family is required' : 'family must be a module family id') }).min(1, 'family must not be empty'),
  ...fields,
  summary: fields.summary.default(''),
  tags: fields.tags.default([]),
  defaultParams: fields.defaultParams.default({}),
  ranges: fields.ranges.default({}),
  materials: fields.materials.default([]),
  notes: fields.notes.default(''),
})

const changeBody = bodySchema({
  name: fields.name.optional(),
  summary: fields.summary.optional(),
  tags: fields.tags.optional(),
  defaultParams: fields.defaultParams.optional(),
  ranges: fields.ranges.optional(),
  materials: fields.materials.optional(),
  notes: fields.notes.optional(),
})

export interface DraftContent {
  name: string
  summary: string
  tags: string[]
  defaultParams: ParamValues
  ranges: ParamRanges
  materials: string[]
  notes: string
}

export type DraftChanges = z.infer<typeof changeBody>

export function parseCreateBody(body: unknown): { familyId: string; content: Omit<DraftContent, 'defaultParams' | 'ranges'> & { defaultParams: Record<string, unknown>; ranges: Record<string, unknown> } } {
  const { family, ...content } = parseBody(createBody, body)
  return { familyId: family, content }
}

export function parseChangeBody(body: unknown, what: string): DraftChanges {
  if (body && typeof body === 'object' && !Array.isArray(body) && 'family' in body) {
    throw validationFailed([{ field: 'family', message: `the family of ${what} cannot change; propose a new entry instead` }])
  }
  return parseBody(changeBody, body)
}

function checkRanges(family: FamilyDefinition, raw: Record<string, unknown>, issues: FieldIssue[]): ParamRanges {
  const ranges: ParamRanges = {}
  for (const [key, value] of Object.entries(raw)) {
    const field = `ranges.${key}`
    const spec = family.params.find((p) => p.key === key)
    if (!spec) {
      issues.push({ field, message: `${field}: ${family.name} has no parameter "${key}" (it has ${family.params.map((p) => p.key).join(', ')})` })
      continue
    }
    if (!Array.isArray(value) || value.length !== 2 || !value.every((v) => typeof v === 'number' && Number.isFinite(v))) {
      issues.push({ field, message: `${field} must be [min, max], two numbers in ${spec.unit || 'the parameter\u2019s unit'}` })
      continue
    }
    const [lo, hi] = value as [number, number]
    const unit = spec.unit ? ` ${spec.unit}` : ''
    if (lo > hi) issues.push({ field, message: `${field}: the minimum ${lo} is above the maximum ${hi}` })
    else if (lo < spec.min || hi > spec.max) issues.push({ field, message: `${field}: [${lo}, ${hi}] must lie inside the family's own range ${spec.min}–${spec.max}${unit}` })
    else ranges[key] = [lo, hi]
  }
  return ranges
}

/**
 * Checks a draft's content against its family; answers the stored form (defaults filled in,
 * so a diff sees every parameter) or throws 400 with every problem.
 */
export function checkDraft(familyId: string, content: Omit<DraftContent, 'defaultParams' | 'ranges'> & { defaultParams: Record<string, unknown>; ranges: Record<string, unknown> }, materials: MaterialView[]): { family: FamilyDefinition; content: DraftContent } {
  const family = families.find((f) => f.id === familyId)
  if (!family) {
    throw validationFailed([{ field: 'family', message: `unknown module family "${familyId}"; known: ${families.map((f) => f.id).join(', ')}` }])
  }
  const issues: FieldIssue[] = []
  const ranges = checkRanges(family, content.ranges, issues)
  let defaultParams: ParamValues = {}
  try {
    defaultParams = validateParams(family, content.defaultParams, { ranges, materials }).echo
  } catch (err) {
    if (!(err instanceof ValidationError)) throw err
    for (const issue of err.issues) {
      const field = issue.field === 'params' ? 'defaultParams' : `defaultParams.${issue.field}`
      issues.push({ field, message: `${field}: ${issue.message}` })
    }
  }
  content.materials.forEach((id, i) => {
    if (!materials.some((m) => m.id === id)) issues.push({ field: `materials.${i}`, message: `materials.${i}: unknown material "${id}"` })
  })
  if (new Set(content.materials).size !== content.materials.length) issues.push({ field: 'materials', message: 'materials lists a material twice' })
  if (issues.length) throw validationFailed(issues)
  return { family, content: { ...content, defaultParams, ranges, tags: [...new Set(content.tags)] } }
}
