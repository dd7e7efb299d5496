/**
 * The heavy computations the API runs off the request thread, as plain data in and out so
 * they cross a worker-thread boundary: an evaluation, a tolerance band, an STL, a bcrypt
 * hash or comparison. The same
 * function runs in a pool thread (worker.ts) or, without threads, in the calling one.
 */
import bcrypt from 'bcryptjs'
import { buildGeometry, buildPartFile, evaluate, getFamily, serializeStl, SolverError, UnknownFamilyError, ValidationError, type EvaluateOptions, type Evaluation, type PartFormat, type PartMetadata } from '../../../catalog'
import { checkPrintability, type PrintabilityReport } from '../../../catalog/printability'
import { toleranceBand, type ToleranceBand } from '../../../catalog/tolerance'
import type { PrinterProfile } from '../../../catalog/window'
import { compareReport, type ComparedRevision, type MaterialNumbers, type ReportComparison } from '../report-comparison'

type Materials = EvaluateOptions['materials']

export type ComputeTask =
  | { kind: 'evaluate'; familyId: string; params: unknown; options: { method?: string; ranges?: EvaluateOptions['ranges']; materials?: Materials } }
  | { kind: 'band'; familyId: string; params: unknown; options: Parameters<typeof toleranceBand>[2] }
  | { kind: 'check'; familyId: string; params: unknown; options: Parameters<typeof toleranceBand>[2]; printer: Partial<PrinterProfile> }
  | { kind: 'stl'; familyId: string; params: unknown }
  | { kind: 'partFile'; format: PartFormat; familyId: string; params: unknown; meta: Omit<PartMetadata, 'family' | 'params'> }
  | { kind: 'reportFit'; familyId: string; measuredCurve: Parameters<typeof compareReport>[1]['measuredCurve']; revision: ComparedRevision; materials: MaterialNumbers }
  | { kind: 'hashPassword'; password: string; cost: number }
  | { kind: 'comparePassword'; password: string; hash: string }

/** A check's heavy part: the band (nominal plus corners) and the printability of the nominal part. */
export interface CheckComputation {
  band: ToleranceBand
  printability: PrintabilityReport
}

/** A report's comparison with its revision's prediction (features and modulus fit), or why there is none. */
export interface ReportFit {
  comparison: ReportComparison | null
  problem: string | null
}

export type ComputeValue = Evaluation | ToleranceBand | CheckComputation | ReportFit | Uint8Array | string | boolean

/** A failure as data: the core's own errors keep their class, fields and details. */
export type ComputeFailure =
  | { name: 'ValidationError'; issues: ValidationError['issues'] }
  | { name: 'SolverError'; message: string; details: Record<string, unknown> }
  | { name: 'UnknownFamilyError'; familyId: string }
  | { name: 'Error'; message: string; stack?: string }

export type ComputeOutcome = { ok: true; value: ComputeValue } | { ok: false; error: ComputeFailure }

export function runTask(task: ComputeTask): ComputeValue {
  switch (task.kind) {
    case 'evaluate':
      return evaluate(task.familyId, task.params, task.options)
    case 'band':
      return toleranceBand(task.familyId, task.params, task.options)
    case 'check': {
      const band = toleranceBand(task.familyId, task.params, task.options)
      const family = getFamily(task.familyId)
      const numeric: Record<string, number> = {}
      for (const spec of family.params) numeric[spec.key] = band.nominal.params[spec.key] as number
      return { band, printability: checkPrintability(family, numeric, task.printer, { ranges: task.options?.ranges }) }
    }
    case 'stl':
      return serializeStl(buildGeometry(task.familyId, task.params))
    case 'partFile':
      return buildPartFile(task.format, task.familyId, task.params, task.meta)
    case 'reportFit':
      return compareReport(task.familyId, { measuredCurve: task.measuredCurve }, task.revision, task.materials)
    // bcrypt is slow on purpose (a quarter second at cost 12): on a pool thread it may block
    case 'hashPassword':
      return bcrypt.hashSync(task.password, task.cost)
    case 'comparePassword':
      return bcrypt.compareSync(task.password, task.hash)
  }
}

export function toFailure(err: unknown): ComputeFailure {
  if (err instanceof ValidationError) return { name: 'ValidationError', issues: err.issues }
  if (err instanceof SolverError) return { name: 'SolverError', message: err.message, details: err.details }
  if (err instanceof UnknownFamilyError) return { name: 'UnknownFamilyError', familyId: err.familyId }
  const e = err instanceof Error ? err : new Error(String(err))
  return { name: 'Error', message: e.message, stack: e.stack }
}

export function fromFailure(failure: ComputeFailure): Error {
  switch (failure.name) {
    case 'ValidationError': return new ValidationError(failure.issues)
    case 'SolverError': return new SolverError(failure.message, failure.details)
    case 'UnknownFamilyError': return new UnknownFamilyError(failure.familyId)
    default: {
      const e = new Error(failure.message)
      if (failure.stack) e.stack = failure.stack
      return e
    }
  }
}

/** Runs a task and reports its outcome as data (what a pool thread sends back). */
export function runTaskSafely(task: ComputeTask): ComputeOutcome {
  try {
    return { ok: true, value: runTask(task) }
  } catch (err) {
    return { ok: false, error: toFailure(err) }
  }
}
