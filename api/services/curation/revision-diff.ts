/** Diffs and revision comparisons: an entry against a revision, and two revisions side by side. */
import { Op } from 'sequelize'
import { families } from '../../../catalog'
import type { AppContext } from '../../context'
import type { Entry, User } from '../../db'
import { notFound } from '../../errors'
import { showEntry } from '../entries'
import { loadVisible } from './access'
import { parseQueryId } from './ids'
import { evaluateDefaults } from './workflow'

type Revisionish = { id: number; number: number; entryId: number; params: Record<string, unknown>; ranges: Record<string, [number, number]>; metrics: Record<string, unknown>; curve: unknown; method: string }

function sameValue(a: unknown, b: unknown): boolean {
  return JSON.stringify(a ?? null) === JSON.stringify(b ?? null)
}

function paramKeys(familyId: string, ...objects: Array<Record<string, unknown>>): string[] {
  const family = families.find((f) => f.id === familyId)
  const keys = family ? family.params.map((p) => p.key) : []
  for (const o of objects) for (const k of Object.keys(o)) if (!keys.includes(k)) keys.push(k)
  return keys
}

function metricSpecs(familyId: string) {
  return families.find((f) => f.id === familyId)?.metrics ?? []
}

/** Side-by-side rows of two snapshots: params, ranges and metrics, each with `changed`. */
function sideBySide(familyId: string, left: { params: Record<string, unknown>; ranges: Record<string, unknown>; metrics: Record<string, unknown> }, right: typeof left) {
  const family = families.find((f) => f.id === familyId)
  const spec = (key: string) => family?.params.find((p) => p.key === key)
  const params = paramKeys(familyId, left.params, right.params).filter((k) => k in left.params || k in right.params).map((key) => ({
    key, label: spec(key)?.label ?? key, unit: spec(key)?.unit ?? '', a: left.params[key] ?? null, b: right.params[key] ?? null, changed: !sameValue(left.params[key], right.params[key]),
  }))
  const ranges = paramKeys(familyId, left.ranges, right.ranges).filter((k) => k in left.ranges || k in right.ranges).map((key) => ({
    key, label: spec(key)?.label ?? key, unit: spec(key)?.unit ?? '', a: left.ranges[key] ?? null, b: right.ranges[key] ?? null, changed: !sameValue(left.ranges[key], right.ranges[key]),
  }))
  const metricKeys = [...new Set([...metricSpecs(familyId).map((m) => m.key), ...Object.keys(left.metrics), ...Object.keys(right.metrics)])]
    .filter((k) => k in left.metrics || k in right.metrics)
  const metrics = metricKeys.map((key) => {
    const m = metricSpecs(familyId).find((s) => s.key === key)
    const a = left.metrics[key] ?? null
    const b = right.metrics[key] ?? null
    return { key, label: m?.label ?? key, unit: m?.unit ?? '', a, b, difference: typeof a === 'number' && typeof b === 'number' ? b - a : null, changed: !sameValue(a, b) }
  })
  return { params, ranges, metrics }
}

function revisionRef(r: Revisionish | null) {
  return r ? { id: r.id, number: r.number, entryId: r.entryId } : null
}

/** The entry as it would be released: a released entry's current revision, otherwise its defaults evaluated now. */
async function proposedSnapshot(context: AppContext, entry: Entry) {
  if ((entry.status === 'released' || entry.status === 'retired' || entry.status === 'merged') && entry.currentRevisionId) {
    const current = await context.db.models.EntryRevision.findByPk(entry.currentRevisionId)
    if (current) return { params: current.params, ranges: current.ranges, metrics: current.metrics, curve: current.curve, method: current.method, warnings: current.warnings, problem: null }
  }
  try {
    const evaluation = await evaluateDefaults(context, entry)
    return { params: evaluation.params, ranges: entry.ranges, metrics: evaluation.metrics, curve: evaluation.curve, method: evaluation.method, warnings: evaluation.warnings, problem: null }
  } catch (err) {
    return { params: entry.defaultParams, ranges: entry.ranges, metrics: {}, curve: null, method: null, warnings: [], problem: (err as Error).message }
  }
}

/**
 * The entry (a draft, a proposal or a released entry) against a revision: by default the
 * current revision of the entry it proposes for (or its own).
 */
export async function entryDiff(context: AppContext, viewer: User, id: number, againstRaw: unknown) {
  const entry = await loadVisible(context, viewer, id)
  return diffOf(context, entry, againstRaw)
}

export async function diffOf(context: AppContext, entry: Entry, againstRaw: unknown) {
  const { Entry, EntryRevision } = context.db.models
  const baseId = entry.proposalForId ?? entry.id
  const base = entry.proposalForId ? await Entry.findByPk(entry.proposalForId) : entry
  let against: Revisionish | null = null
  if (againstRaw !== undefined && againstRaw !== '') {
    const revisionId = parseQueryId(againstRaw, 'against')
    against = await EntryRevision.findOne({ where: { id: revisionId, entryId: { [Op.in]: [entry.id, baseId] } } }) as Revisionish | null
    if (!against) throw notFound(`revision ${revisionId} of this entry`)
  } else if (base?.currentRevisionId) {
    against = await EntryRevision.findByPk(base.currentRevisionId) as Revisionish | null
  }
  const proposed = await proposedSnapshot(context, entry)
  const rows = sideBySide(entry.familyId, against ?? { params: {}, ranges: {}, metrics: {} }, proposed)
  const isCurrent = Boolean(against && base && against.id === base.currentRevisionId)
  const fieldNames = ['name', 'summary', 'tags', 'materials', 'notes'] as const
  return {
    entryId: entry.id,
    against: revisionRef(against),
    // a side is `a` (the revision) and `b` (this entry)
    ...rows,
    fields: isCurrent && base && base !== entry
      ? fieldNames.map((field) => ({ field, a: base[field], b: entry[field], changed: !sameValue(base[field], entry[field]) }))
      : [],
    curves: { a: against?.curve ?? null, b: proposed.curve },
    method: proposed.method,
    warnings: proposed.warnings,
    evaluationProblem: proposed.problem,
  }
}

/** GET /api/entries/:id/revisions/compare?a=&b= */
export async function compareRevisions(context: AppContext, viewer: User, id: number, query: Record<string, unknown>) {
  const entry = await loadVisible(context, viewer, id)
  const a = parseQueryId(query.a, 'a')
  const b = parseQueryId(query.b, 'b')
  const detail = await showEntry(context, viewer, entry.id)
  const ra = detail.revisions.find((r) => r.id === a)
  const rb = detail.revisions.find((r) => r.id === b)
  if (!ra) throw notFound(`revision ${a} of this entry`)
  if (!rb) throw notFound(`revision ${b} of this entry`)
  return { entryId: entry.id, a: ra, b: rb, ...sideBySide(entry.familyId, ra, rb) }
}
