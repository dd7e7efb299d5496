/**
 * Checking a configuration of a shelf entry: the nominal evaluation, the curves and metrics
 * at the manufacturing-tolerance corners, the verdict against the engineer's force window
 * (nominal and whole band) and the printability checks. Every number comes from catalog/.
 */
import type { z } from 'zod'
import type * as contract from '../../contract/api'
import { Op } from 'sequelize'
import type { Evaluation, FamilyDefinition } from '../../catalog'
import { DEFAULT_TOLERANCE_NOTE, type ToleranceBand } from '../../catalog/tolerance'
import { judgeWithBand } from '../../catalog/window'
import type { AppContext } from '../context'
import type { Entry, EntryRevision, ParamRanges, ParamValues, User } from '../db'
import { notFound } from '../errors'
import { visibleTo } from './entries'
import { compute } from './compute-pool'
import { findFamily } from './families'
import { listMaterials, type MaterialView } from './materials'
import { resolveConfiguration, type ConfigurationInput, type RawConfiguration } from './configuration-input'

/** An entry made ready to configure: its family and the ranges parameters must stay inside. */
export interface ConfigureTarget {
  entry: Entry & { currentRevision?: EntryRevision | null }
  family: FamilyDefinition
  ranges: ParamRanges
  /** Values under the ones given: the entry's defaults (nothing for a saved configuration, stored complete). */
  defaults: ParamValues
  /** Material ids the parameters may name; empty means any curated material. */
  releasedMaterials: string[]
  materials: MaterialView[]
  /** Said with every answer about this entry (retired, not released, moved on). */
  notices: string[]
}

export const RETIRED_NOTICE =
  'This entry is retired: it stays available for parts already made from it, but look on the shelf for its successor before using it in a new design.'
const UNRELEASED_NOTICE =
  'This entry is not released yet: its ranges and numbers have not been reviewed by a librarian.'

function entryNotices(entry: Pick<Entry, 'status'>): string[] {
  if (entry.status === 'retired') return [RETIRED_NOTICE]
  if (entry.status !== 'released') return [UNRELEASED_NOTICE]
  return []
}

/** The entry as the viewer may see it, with its family; 404 when missing, not visible or its family is gone. */
export async function loadEntry(context: AppContext, viewer: User, entryId: number): Promise<Entry & { currentRevision?: EntryRevision | null }> {
  const { Entry, EntryRevision } = context.db.models
  const entry = await Entry.findOne({
    where: { [Op.and]: [{ id: entryId }, visibleTo(viewer)] },
    include: [{ model: EntryRevision, as: 'currentRevision', attributes: ['id', 'number', 'ranges'] }],
  })
  if (!entry) throw notFound('entry')
  return entry
}

/** The entry as configured live: its current ranges, defaults and released materials. */
export async function configureTarget(context: AppContext, entry: ConfigureTarget['entry']): Promise<ConfigureTarget> {
  return {
    entry, family: findFamily(entry.familyId), ranges: entry.ranges, defaults: entry.defaultParams, releasedMaterials: entry.materials,
    materials: await listMaterials(context), notices: entryNotices(entry),
  }
}

export function resolveFor(target: ConfigureTarget, raw: RawConfiguration): ConfigurationInput {
  return resolveConfiguration(raw, {
    family: target.family, defaults: target.defaults, releasedMaterials: target.releasedMaterials, ranges: target.ranges, materials: target.materials,
  })
}

/** The family's own numeric parameters of an evaluation (material fields left out). */
function numericParams(family: FamilyDefinition, evaluation: Pick<Evaluation, 'params'>): Record<string, number> {
  const out: Record<string, number> = {}
  for (const spec of family.params) out[spec.key] = evaluation.params[spec.key] as number
  return out
}

/** The nominal evaluation and its tolerance corners, on the compute pool (five solves for the nonlinear methods). */
export function evaluateTarget(target: ConfigureTarget, input: ConfigurationInput, purpose = 'the predicted curve'): Promise<ToleranceBand> {
  return compute.toleranceBand(target.family.id, input.params, bandOptions(target, input), askedOf(target, input, purpose))
}

function bandOptions(target: ConfigureTarget, input: ConfigurationInput) {
  return { method: input.method ?? undefined, ranges: target.ranges, materials: target.materials, tolerance: input.tolerance ?? undefined }
}

/** "the check of entry 12 "Panel latch" (bistable-beam, method nonlinear-fe)": what a 422 compute_budget_exceeded names. */
export function askedOf(target: ConfigureTarget, input: ConfigurationInput, purpose: string): string {
  const method = input.method ? `, method ${input.method}` : ''
  return `${purpose} of entry ${target.entry.id} "${target.entry.name}" (${target.family.id}${method})`
}

// The answers' shapes are the wire contract's (contract/api.ts).
export type CheckResult = z.infer<typeof contract.CheckResult>

const PRINTABILITY_BASIS = 'common practice (FDM rules of thumb, not a published standard)'

/** The check (or, with task 'datasheet', the data sheet's check): band and printability on the compute pool, under its budget. */
export async function checkTarget(target: ConfigureTarget, input: ConfigurationInput, task: 'check' | 'datasheet' = 'check'): Promise<CheckResult> {
  const { entry, family } = target
  const { band, printability } = await compute.check(family.id, input.params, bandOptions(target, input), input.printer ?? {}, {
    task, what: askedOf(target, input, task === 'check' ? 'the check' : 'the data sheet'),
  })
  const evaluation = band.nominal
  const numeric = numericParams(family, evaluation)
  const envelope = family.envelope(numeric)
  const verdict = input.window ? judgeWithBand(input.window, evaluation.metrics, band.metrics, { envelope }) : null
  const revision = entry.currentRevision ? { id: entry.currentRevision.id, number: entry.currentRevision.number } : null
  return {
    entry: { id: entry.id, name: entry.name, status: entry.status, familyId: family.id, familyName: family.name, revision },
    evaluation,
    band: {
      tolerance: band.tolerance,
      defaulted: input.tolerance === null,
      note: input.tolerance === null ? DEFAULT_TOLERANCE_NOTE : null,
      curve: band.curve,
      metrics: band.metrics,
      complete: band.complete,
      warnings: band.warnings,
    },
    verdict,
    printability: { ...printability, basis: PRINTABILITY_BASIS },
    envelope,
    notices: [...target.notices],
  }
}
