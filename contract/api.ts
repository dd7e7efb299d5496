/**
 * The wire contract of the Flexshelf HTTP API (docs/api.md): every JSON body a route answers,
 * defined once as a zod schema. The API's services build these shapes, the web client's
 * `web/src/api` takes its types from here (type-only imports, so the browser bundle carries
 * no schema), and the API tests parse every answer against `responseContract`.
 *
 * The catalog's own result types (an evaluation, a curve, a judgement, a printability report,
 * a force window, a shelf entry, a search answer and its confirmation) are described field by
 * field and pinned to the catalog's TypeScript types at the end of this file: a field added to
 * one and not the other fails the type check.
 */
import { z } from 'zod'
import { WIDE_BEAM_MODES } from '../catalog/mechanics/wide-beam'
import type { CurveComparison } from '../catalog/calibration'
import type { PrintabilityReport } from '../catalog/printability'
import type { Curve, Evaluation, MetricSpec, ModuleKind, ParamSpec } from '../catalog/schema/types'
import type { Confirmation, SearchAnswer, SearchResult, ShelfEntry } from '../catalog/search/types'
import type { ForceWindow, Judgement } from '../catalog/window'

/** A catalog type on the wire: an object carrying at least `keys`. */
function catalogValue<T>(what: string, keys: readonly string[]) {
  return z.custom<T>((v) => typeof v === 'object' && v !== null && keys.every((k) => k in v), { message: `expected ${what} (with ${keys.join(', ')})` })
}

/** True when A and B are each assignable to the other and name the same fields; `never` otherwise, so `true satisfies Same<A, B>` fails the type check. */
type Same<A, B> = [A] extends [B] ? ([B] extends [A] ? ([keyof A] extends [keyof B] ? ([keyof B] extends [keyof A] ? true : never) : never) : never) : never

const isoDate = z.string().refine((s) => !Number.isNaN(Date.parse(s)), 'expected an ISO 8601 date')
const metricValue = z.union([z.number(), z.boolean(), z.null()])
const paramValues = z.record(z.string(), z.union([z.number(), z.string()]))
const paramRanges = z.record(z.string(), z.tuple([z.number(), z.number()]))
const box = z.object({ x: z.number(), y: z.number(), z: z.number() })
const band = z.tuple([z.number(), z.number()])
const metricBand = z.record(z.string(), band.nullable())
const revisionRef = z.object({ id: z.number().int(), number: z.number().int() })

export const roles = ['engineer', 'contributor', 'librarian', 'admin'] as const
export const Role = z.enum(roles)
export const moduleKinds = ['bistable', 'spring', 'guide', 'hinge', 'latch'] as const satisfies readonly ModuleKind[]
export const ModuleKindSchema = z.enum(moduleKinds)
export const entryStatuses = ['draft', 'in_review', 'released', 'retired', 'rejected', 'merged'] as const
export const EntryStatusSchema = z.enum(entryStatuses)

// ── errors ───────────────────────────────────────────────────────────────────────────

export const FieldIssue = z.object({ field: z.string(), message: z.string() })
/** Every error answer: { error: { code, message, details } }. */
export const ErrorBody = z.object({
  error: z.object({ code: z.string().min(1), message: z.string().min(1), details: z.record(z.string(), z.unknown()).nullable().optional() }),
})

// ── people ───────────────────────────────────────────────────────────────────────────

export const User = z.object({
  id: z.number().int(), email: z.string(), displayName: z.string(), role: Role, createdAt: isoDate,
  hasPassword: z.boolean().optional(), mustChangePassword: z.boolean().optional(), sso: z.boolean().optional(),
})
export const Session = z.object({ token: z.string().min(1), user: User })
export const PersonRef = z.object({ id: z.number().int(), displayName: z.string() })

// ── families and materials ───────────────────────────────────────────────────────────

const axisSpec = z.object({ label: z.string(), unit: z.string() })
const axes = z.object({ displacement: axisSpec, force: axisSpec })
const ParamSpecSchema = z.object({
  key: z.string(), label: z.string(), unit: z.string(), default: z.number(), min: z.number(), max: z.number(), step: z.number(), help: z.string(),
  integer: z.boolean().optional(),
  role: z.enum(['wall', 'length', 'angle', 'count', 'ratio']).optional(),
})
const MetricSpecSchema = z.object({ key: z.string(), label: z.string(), unit: z.string(), help: z.string().optional() })
/** A family as the API sends it: the catalog definition without its functions. */
export const Family = z.object({
  id: z.string(),
  name: z.string(),
  kind: ModuleKindSchema,
  summary: z.string(),
  params: z.array(ParamSpecSchema),
  rules: z.array(z.object({ fields: z.array(z.string()) })),
  methods: z.array(z.object({ id: z.string(), label: z.string(), source: z.string() })),
  defaultMethod: z.string(),
  metrics: z.array(MetricSpecSchema),
  axes,
  cautions: z.array(z.string()),
  /** The two parameters the design map sweeps first (x across, y up), or null for the map's own choice. */
  designMap: z.object({ sweep: z.tuple([z.string(), z.string()]) }).nullable(),
  /** The family bends beams and takes `wideBeam` ('auto' | 'off'). */
  bendsBeams: z.boolean(),
})

export const Material = z.object({
  id: z.string(), name: z.string(), process: z.string(), modulus: z.number(), poissonRatio: z.number(), poissonRatioSource: z.string(), strainLimit: z.number(), density: z.number(), notes: z.string(), source: z.string(),
})

const CurveSchema = z.object({
  displacement: z.array(z.number()),
  force: z.array(z.number()),
  strain: z.array(z.number()).optional(),
  axes,
})
const EvaluationSchema = z.object({
  family: z.string(),
  method: z.string(),
  params: paramValues,
  material: z.object({ id: z.string().nullable(), name: z.string(), modulus: z.number(), strainLimit: z.number(), poissonRatio: z.number() }),
  curve: CurveSchema,
  metrics: z.record(z.string(), metricValue),
  warnings: z.array(z.string()),
  source: z.string(),
  /** The wide-beam rule as the model applied it (families that bend beams). */
  bending: z.object({
    wideBeam: z.enum(WIDE_BEAM_MODES), poissonRatio: z.number(), depthOverThickness: z.number(), factor: z.number(), modulus: z.number(), statement: z.string(),
  }).optional(),
})

// ── entries ──────────────────────────────────────────────────────────────────────────

export const EntrySummary = z.object({
  id: z.number().int(),
  familyId: z.string(),
  /** The family's name, or its id when the family is no longer registered. */
  familyName: z.string(),
  /** null when the family is no longer registered. */
  kind: ModuleKindSchema.nullable(),
  name: z.string(),
  summary: z.string(),
  tags: z.array(z.string()),
  status: EntryStatusSchema,
  owner: PersonRef,
  currentRevision: z.object({ id: z.number().int(), number: z.number().int(), metrics: z.record(z.string(), metricValue) }).nullable(),
  updatedAt: isoDate,
})

export const Revision = z.object({
  id: z.number().int(),
  number: z.number().int(),
  createdAt: isoDate,
  createdBy: PersonRef,
  params: paramValues,
  ranges: paramRanges,
  method: z.string(),
  curve: CurveSchema,
  metrics: z.record(z.string(), metricValue),
  warnings: z.array(z.string()),
})

export const CommentKind = z.enum(['comment', 'changes_requested', 'rejected'])
export const EntryComment = z.object({ id: z.number().int(), kind: CommentKind, text: z.string(), author: PersonRef.nullable(), createdAt: isoDate })

export const ReportStatus = z.enum(['submitted', 'accepted', 'rejected'])
export const ReportComparison = catalogValue<CurveComparison & { revisionId: number; revisionNumber: number; predictedMaterial: { id: string | null; name: string; modulus: number } }>(
  'a report comparison', ['revisionId', 'revisionNumber', 'predictedMaterial'],
)
export const TestReport = z.object({
  id: z.number().int(),
  revisionId: z.number().int().nullable(),
  status: ReportStatus,
  uploader: PersonRef.nullable(),
  reviewer: PersonRef.nullable(),
  originalName: z.string(),
  hasPhoto: z.boolean(),
  printer: z.string(),
  material: z.string(),
  lot: z.string(),
  orientation: z.string(),
  testSpeed: z.number().nullable(),
  notes: z.string(),
  reviewNote: z.string(),
  reviewedAt: isoDate.nullable(),
  /** A preview of at most 400 points (peaks kept) for drawing; the whole curve: GET /api/reports/:id/curve. */
  measuredCurve: z.object({ displacement: z.array(z.number()), force: z.array(z.number()) }),
  /** Points in the whole measured curve. */
  points: z.number().int().nonnegative(),
  createdAt: isoDate,
  comparison: ReportComparison.nullable(),
  comparisonProblem: z.string().nullable(),
})
export const TestReportWithEntry = TestReport.extend({ entry: z.object({ id: z.number().int(), name: z.string(), familyId: z.string() }) })

export const EntryDetail = EntrySummary.extend({
  defaultParams: paramValues,
  ranges: paramRanges,
  materials: z.array(z.string()),
  notes: z.string(),
  revisions: z.array(Revision),
  proposalForId: z.number().int().nullable(),
  reports: z.array(TestReport),
  comments: z.array(EntryComment),
  proposalFor: z.object({ id: z.number().int(), name: z.string(), status: EntryStatusSchema, currentRevisionId: z.number().int().nullable() }).nullable(),
  proposals: z.array(EntrySummary.extend({ proposalForId: z.number().int().nullable() })),
})

function diffRow<T extends z.ZodType>(value: T) {
  return z.object({ key: z.string(), label: z.string(), unit: z.string(), a: value.nullable(), b: value.nullable(), changed: z.boolean() })
}
const paramDiffRow = diffRow(z.union([z.number(), z.string()]))
const rangeDiffRow = diffRow(z.tuple([z.number(), z.number()]))
const metricDiffRow = diffRow(metricValue).extend({ difference: z.number().nullable() })

export const EntryDiff = z.object({
  entryId: z.number().int(),
  against: z.object({ id: z.number().int(), number: z.number().int(), entryId: z.number().int() }).nullable(),
  params: z.array(paramDiffRow),
  ranges: z.array(rangeDiffRow),
  metrics: z.array(metricDiffRow),
  fields: z.array(z.object({ field: z.enum(['name', 'summary', 'tags', 'materials', 'notes']), a: z.unknown(), b: z.unknown(), changed: z.boolean() })),
  curves: z.object({ a: CurveSchema.nullable(), b: CurveSchema.nullable() }),
  method: z.string().nullable(),
  warnings: z.array(z.string()),
  evaluationProblem: z.string().nullable(),
})

export const RevisionComparison = z.object({
  entryId: z.number().int(), a: Revision, b: Revision, params: z.array(paramDiffRow), ranges: z.array(rangeDiffRow), metrics: z.array(metricDiffRow),
})

export const CalibrationGroup = z.object({
  printer: z.string(), material: z.string(), count: z.number().int(), moduli: z.array(z.object({ reportId: z.number().int(), modulus: z.number() })),
  mean: z.number(), standardDeviation: z.number().nullable(), range: z.number(), min: z.number(), max: z.number(),
})
export const EntryCalibration = z.object({
  entryId: z.number().int(),
  groups: z.array(CalibrationGroup),
  reports: z.array(z.object({
    reportId: z.number().int(), revisionId: z.number().int().nullable(), printer: z.string(), material: z.string(), lot: z.string(),
    modulus: z.number(), predictedModulus: z.number(), predictedMaterial: z.object({ id: z.string().nullable(), name: z.string(), modulus: z.number() }),
  })),
  unfitted: z.array(z.object({ reportId: z.number().int(), reason: z.string() })),
})

export const ReviewQueue = z.object({
  entries: z.array(z.object({ entry: EntryDetail, diff: EntryDiff })),
  reports: z.array(TestReportWithEntry),
  /** The page shown (limit, offset) and how many wait in all. */
  page: z.object({ limit: z.number().int(), offset: z.number().int(), totalEntries: z.number().int(), totalReports: z.number().int() }),
})

export const OutboxMessage = z.object({
  id: z.number().int(), to: z.array(z.string()), subject: z.string(), text: z.string(), at: isoDate, transport: z.string(), status: z.string(), error: z.string().nullable(),
})

export const AuditEvent = z.object({
  id: z.number().int(), at: isoDate, actor: PersonRef.nullable(), action: z.string(), subjectType: z.string(), subjectId: z.string().nullable(), details: z.record(z.string(), z.unknown()).nullable(),
})

// ── configure ────────────────────────────────────────────────────────────────────────

export const ToleranceSetting = z.object({
  /** ± wall thickness, mm. */
  thickness: z.number(),
  /** ± modulus as a fraction (0.1 = ±10 %). */
  modulus: z.number(),
})
export const PrinterSetting = z.object({ nozzle: z.number(), layer: z.number() })
const windowRange = z.object({ min: z.number().optional(), max: z.number().optional() })
const ForceWindowSchema = z.object({
  kind: ModuleKindSchema,
  peakForce: windowRange.optional(),
  holdingForce: windowRange.optional(),
  travel: windowRange.optional(),
  stiffness: windowRange.optional(),
  rotationalStiffness: windowRange.optional(),
  rotation: windowRange.optional(),
  matingForce: windowRange.optional(),
  separationForce: windowRange.optional(),
  footprint: z.object({ length: z.number().optional(), width: z.number().optional() }).optional(),
  materials: z.array(z.string()).optional(),
  printer: z.object({ nozzle: z.number(), layer: z.number() }).partial().optional(),
  tolerance: z.object({ thickness: z.number(), modulus: z.number() }).partial().optional(),
  text: z.string().optional(),
  limit: z.number().optional(),
})
const verdict = z.enum(['inside', 'edge', 'outside'])
const JudgementSchema = z.object({
  verdict,
  margin: z.number().nullable(),
  constraints: z.array(z.object({
    id: z.string(), label: z.string(), unit: z.string(), bound: z.number().nullable(), value: z.number().nullable(), margin: z.number().nullable(), verdict,
  })),
  strain: z.object({ basis: z.enum(['peak', 'working-range']), safetyFactor: z.number(), margin: z.number(), verdict }).nullable(),
})
const PrintabilityReportSchema = z.object({
  printer: z.object({ nozzle: z.number(), layer: z.number(), lineWidth: z.number(), minimumWall: z.number() }),
  checks: z.array(z.object({
    id: z.string(), level: z.enum(['ok', 'warn', 'fail']), message: z.string(),
    fix: z.object({ key: z.string(), from: z.number(), to: z.number() }).optional(),
  })),
  notes: z.array(z.string()),
})
/** The configure check's printability: the catalog's report and the rule it follows. */
const PrintabilitySchema = PrintabilityReportSchema.extend({ basis: z.string() })

export const BandView = z.object({
  tolerance: ToleranceSetting,
  /** True when no tolerance was given and the common-practice default was used. */
  defaulted: z.boolean(),
  note: z.string().nullable(),
  curve: z.object({ displacement: z.array(z.number()), low: z.array(z.number()), high: z.array(z.number()) }),
  metrics: z.record(z.string(), z.tuple([z.number(), z.number()]).nullable()),
  complete: z.boolean(),
  warnings: z.array(z.string()),
})

export const CheckResult = z.object({
  entry: z.object({ id: z.number().int(), name: z.string(), status: z.string(), familyId: z.string(), familyName: z.string(), revision: revisionRef.nullable() }),
  evaluation: EvaluationSchema,
  band: BandView,
  verdict: z.object({ nominal: JudgementSchema, band: JudgementSchema }).nullable(),
  printability: PrintabilitySchema,
  /** Outer size of the part, mm (x along, y across, z print height). */
  envelope: box,
  notices: z.array(z.string()),
})

const range = { id: z.string(), label: z.string(), min: z.number().nullable(), max: z.number().nullable() }
/** A force window drawn on the curve, in the curve's own units. */
export const WindowOverlay = z.discriminatedUnion('kind', [
  /** A horizontal band of force (either side may be open). */
  z.object({ kind: z.literal('force-range'), ...range }),
  /** A vertical band of displacement or rotation. */
  z.object({ kind: z.literal('displacement-range'), ...range }),
  /** Lines through the origin: force per unit displacement (moment per degree for hinges). */
  z.object({ kind: z.literal('slope-range'), ...range }),
])
export const CurveMarker = z.object({ kind: z.enum(['stable', 'unstable']), label: z.string(), displacement: z.number(), force: z.number() })
export const DatasheetMetric = z.object({
  key: z.string(), label: z.string(), unit: z.string(), value: metricValue,
  /** [low, high] over the tolerance band; null when a corner has no value or the metric is a flag. */
  band: z.tuple([z.number(), z.number()]).nullable(),
})

export const Datasheet = z.object({
  title: z.string(),
  /** When the sheet was made (ISO 8601) and the same as a date (YYYY-MM-DD, UTC). */
  generatedAt: isoDate,
  date: z.string().regex(/^\d{4}-\d{2}-\d{2}$/),
  /** Name of the PDF download. */
  fileName: z.string(),
  entry: z.object({ id: z.number().int(), name: z.string(), summary: z.string(), status: z.string(), revision: revisionRef.nullable() }),
  family: z.object({ id: z.string(), name: z.string(), kind: z.string() }),
  /** The saved configuration the sheet was made from, when it was. */
  configuration: z.object({ id: z.number().int(), name: z.string() }).nullable(),
  parameters: z.array(z.object({ key: z.string(), label: z.string(), value: z.number(), unit: z.string() })),
  material: z.object({ id: z.string().nullable(), name: z.string(), modulus: z.number(), strainLimit: z.number(), poissonRatio: z.number(), source: z.string() }),
  /** `bending`: the wide-beam rule as applied (catalog/mechanics/wide-beam.ts), null for a family that bends no beams. */
  method: z.object({ id: z.string(), label: z.string(), source: z.string(), bending: z.string().nullable() }),
  curve: z.object({ axes, displacement: z.array(z.number()), force: z.array(z.number()), band: BandView, window: z.array(WindowOverlay), markers: z.array(CurveMarker) }),
  metrics: z.array(DatasheetMetric),
  verdict: z.object({ window: ForceWindowSchema, nominal: JudgementSchema, band: JudgementSchema }).nullable(),
  printability: PrintabilitySchema,
  envelope: box,
  warnings: z.array(z.string()),
  cautions: z.array(z.string()),
  notices: z.array(z.string()),
})

export const SavedConfiguration = z.object({
  id: z.number().int(),
  name: z.string(),
  owner: PersonRef,
  entry: z.object({ id: z.number().int(), name: z.string(), familyId: z.string(), status: z.string() }),
  params: paramValues,
  method: z.string().nullable(),
  window: ForceWindowSchema.nullable(),
  tolerance: ToleranceSetting.nullable(),
  printer: PrinterSetting.partial().nullable(),
  /** The revision the configuration was saved from. */
  savedRevision: revisionRef.nullable(),
  /** The entry's revision now. */
  currentRevision: revisionRef.nullable(),
  /** True when the entry has a newer revision than the one this was saved from. */
  revisionChanged: z.boolean(),
  /** Both null unless shared, and always null through a share link. */
  shareToken: z.string().nullable(),
  shareUrl: z.string().nullable(),
  /** True when opened through a share link. */
  readOnly: z.boolean(),
  /** Saved values no longer accepted (bounds tightened since), by field; empty when it checks as saved. */
  problems: z.array(FieldIssue),
  notices: z.array(z.string()),
  createdAt: isoDate,
  updatedAt: isoDate,
})

// ── compare ──────────────────────────────────────────────────────────────────────────

const level = z.enum(['ok', 'warn', 'fail'])
/** One candidate of a comparison: a search result (an entry and its parameters) or a saved configuration, checked as the configure screen checks it. */
export const ComparedCandidate = z.object({
  label: z.string(),
  source: z.discriminatedUnion('kind', [
    z.object({ kind: z.literal('result'), entryId: z.number().int(), params: paramValues }),
    z.object({ kind: z.literal('saved'), configurationId: z.number().int(), name: z.string() }),
  ]),
  check: CheckResult,
})
/** Up to four candidates side by side (GET /api/compare). */
export const Comparison = z.object({
  candidates: z.array(ComparedCandidate),
  metrics: z.array(z.object({
    key: z.string(), label: z.string(), unit: z.string(),
    values: z.array(metricValue),
    /** Low and high over the tolerance band, per candidate. */
    bands: z.array(band.nullable()),
    better: z.enum(['higher', 'lower']).nullable(),
    /** Index of the best value (null when there is no direction or fewer than two numbers). */
    best: z.number().int().nonnegative().nullable(),
  })),
  /** Printability side by side: each check's label and its status per candidate. */
  printability: z.array(z.object({ id: z.string(), label: z.string(), statuses: z.array(z.string().nullable()), levels: z.array(level.nullable()) })),
  cautions: z.array(z.string()),
})

// ── search ───────────────────────────────────────────────────────────────────────────

const entryId = z.union([z.number(), z.string()])
const ShelfEntrySchema = z.object({
  id: entryId, familyId: z.string(), name: z.string(), summary: z.string(), tags: z.array(z.string()), materials: z.array(z.string()),
  defaultParams: paramValues, ranges: paramRanges, status: z.enum(['draft', 'in_review', 'released', 'retired']),
})
const ConfirmationSchema = z.object({
  method: z.string(),
  metrics: z.record(z.string(), metricValue).nullable(),
  agreement: z.record(z.string(), z.number()),
  tolerance: z.record(z.string(), z.number()).optional(),
  withinTolerance: z.boolean().optional(),
  verdict: verdict.optional(),
  band: metricBand.optional(),
  margin: z.number().optional(),
  uncertain: z.array(z.string()).optional(),
  error: z.string().optional(),
})
const SearchResultSchema = z.object({
  entryId,
  entryName: z.string(),
  family: z.string(),
  params: paramValues,
  metrics: z.record(z.string(), metricValue),
  band: metricBand,
  margin: z.number(),
  safetyFactor: z.number().nullable(),
  method: z.string(),
  uncertain: z.array(z.string()),
  confirmed: ConfirmationSchema.nullable(),
  why: z.string(),
  rank: z.object({
    tier: z.union([z.literal(1), z.literal(2)]), marginBand: band, safetyBand: band.nullable(), footprint: z.number(), volume: z.number(),
  }).optional(),
  closeVariants: z.array(z.object({ params: paramValues, margin: z.number(), safetyFactor: z.number().nullable() })).optional(),
})
/** The catalog's search answer (catalog/search/types.ts), field by field. */
const CatalogSearchAnswer = z.object({
  results: z.array(SearchResultSchema),
  considered: z.number(),
  elapsedMs: z.number(),
  explanation: z.string(),
  dropped: z.array(z.object({ entryId, entryName: z.string(), params: paramValues, reason: z.string(), uncertain: z.array(z.string()) })),
})
/** The scatter's points: every candidate the answer kept, capped (api/services/search/tradeoffs.ts). */
export const SearchTradeoffs = z.object({
  points: z.array(z.object({
    entryId: z.union([z.number(), z.string()]),
    entryName: z.string(),
    family: z.string(),
    params: paramValues,
    margin: z.number(),
    safetyFactor: z.number().nullable(),
    footprint: z.number().nullable(),
    position: z.number().int().positive().nullable(),
    variantOf: z.number().int().positive().nullable(),
  })),
  total: z.number().int().nonnegative(),
  capped: z.boolean(),
})
/** The API's search answer: the catalog's, with the scatter's points. */
export const SearchAnswerSchema = CatalogSearchAnswer.extend({ tradeoffs: SearchTradeoffs })
export const SearchJobStart = z.object({ id: z.string().min(1), status: z.enum(['running', 'done']), cached: z.boolean() })
export const SearchJobState = z.object({
  id: z.string().min(1),
  status: z.enum(['running', 'done', 'failed', 'cancelled']),
  cached: z.boolean(),
  progress: z.object({ done: z.number(), total: z.number(), considered: z.number(), phase: z.string() }).nullable(),
  result: SearchAnswerSchema.extend({ cached: z.boolean() }).nullable(),
  error: z.object({ code: z.string(), message: z.string(), details: z.record(z.string(), z.unknown()).nullable() }).nullable(),
})

// ── every route's answer ─────────────────────────────────────────────────────────────

const readiness = z.object({
  status: z.enum(['ready', 'not_ready']),
  checks: z.record(z.string(), z.object({ status: z.enum(['ok', 'failed']), ms: z.number(), error: z.string().optional() })),
})

const entryBody = z.object({ entry: EntryDetail })
const reportBody = z.object({ report: TestReportWithEntry })
const configurationBody = z.object({ configuration: SavedConfiguration })
const datasheetBody = z.object({ datasheet: Datasheet })

/**
 * The JSON answer of each route ('METHOD /api/path' as Express names it) when it succeeds;
 * any failure answers ErrorBody. Routes answering files (STL, CSV, PDF, photos), an event
 * stream or an empty 204 have no JSON body and no row.
 */
export const responseContract = {
  'GET /api/health': z.object({ status: z.string(), version: z.string(), database: z.string() }),
  'GET /api/ready': readiness,
  'GET /api/auth/options': z.object({
    passwordSignin: z.boolean(),
    signup: z.object({ open: z.boolean(), domains: z.array(z.string()) }),
    sso: z.object({ name: z.string() }).nullable(),
  }),
  'POST /api/auth/password-reset': z.object({ status: z.literal('accepted'), message: z.string() }),
  'POST /api/auth/signup': Session,
  'POST /api/auth/signin': Session,
  /** Single sign-on's hand-over: the session the callback left in its cookie, collected once. */
  'POST /api/auth/oidc/session': Session,
  'GET /api/auth/me': z.object({ user: User }),
  'GET /api/users': z.object({ users: z.array(User) }),
  'PATCH /api/users/:id/role': z.object({ user: User }),
  'POST /api/users/:id/unlock': z.object({ user: User, cleared: z.number().int().nonnegative() }),
  'GET /api/families': z.object({ families: z.array(Family) }),
  'GET /api/families/:id': z.object({ family: Family }),
  'POST /api/families/:id/evaluate': EvaluationSchema,
  'GET /api/materials': z.object({ materials: z.array(Material) }),
  'GET /api/shelf': z.object({ entries: z.array(ShelfEntrySchema) }),
  'GET /api/entries': z.object({ entries: z.array(EntrySummary) }),
  'GET /api/entries/:id': entryBody,
  'POST /api/entries': entryBody,
  'PATCH /api/entries/:id': entryBody,
  'POST /api/entries/:id/proposals': entryBody,
  'POST /api/entries/:id/submit': entryBody,
  'POST /api/entries/:id/release': entryBody,
  'POST /api/entries/:id/reject': entryBody,
  'POST /api/entries/:id/request-changes': entryBody,
  'POST /api/entries/:id/retire': entryBody,
  'POST /api/entries/:id/comments': z.object({ comment: EntryComment }),
  'GET /api/entries/:id/diff': z.object({ diff: EntryDiff }),
  'GET /api/entries/:id/revisions/compare': z.object({ comparison: RevisionComparison }),
  'POST /api/entries/:id/check': CheckResult,
  'GET /api/entries/:id/datasheet': datasheetBody,
  'GET /api/entries/:id/calibration': z.object({ calibration: EntryCalibration }),
  'POST /api/entries/:id/reports': reportBody,
  'POST /api/reports/:id/accept': reportBody,
  'POST /api/reports/:id/reject': reportBody,
  'GET /api/reports/:id/curve': z.object({
    reportId: z.number().int(), points: z.number().int().nonnegative(), measuredCurve: z.object({ displacement: z.array(z.number()), force: z.array(z.number()) }),
  }),
  'POST /api/reports/:id/adopt-modulus': z.object({ material: Material }),
  'GET /api/review-queue': ReviewQueue,
  'GET /api/outbox': z.object({ messages: z.array(OutboxMessage) }),
  'GET /api/audit': z.object({ events: z.array(AuditEvent) }),
  'GET /api/configurations': z.object({ configurations: z.array(SavedConfiguration) }),
  'POST /api/configurations': configurationBody,
  'GET /api/configurations/:id': configurationBody,
  'GET /api/configurations/:id/check': CheckResult,
  'GET /api/configurations/:id/datasheet': datasheetBody,
  'POST /api/configurations/:id/share': z.object({ shareToken: z.string().min(1), url: z.string().min(1) }),
  'GET /api/shared/:token': configurationBody,
  'GET /api/shared/:token/check': CheckResult,
  'GET /api/shared/:token/datasheet': datasheetBody,
  'GET /api/compare': z.object({ comparison: Comparison }),
  'POST /api/search': SearchAnswerSchema.extend({ cached: z.boolean().optional() }),
  'POST /api/searches': SearchJobStart,
  'GET /api/searches/:id': SearchJobState,
} as const satisfies Record<string, z.ZodType>

export type ContractRoute = keyof typeof responseContract

/**
 * The routes that answer no JSON body when they succeed, and what they answer instead: a
 * file (a model, a drawing, a CSV, a PDF, a photo), an event stream, an empty 204 or a
 * redirect. With responseContract this names every route; the contract test fails on a
 * registered route in neither.
 */
export const bodilessRoutes: Readonly<Record<string, 'file' | 'event-stream' | 'empty' | 'redirect'>> = {
  // a part's files, from its entry, a saved configuration or a share link
  ...Object.fromEntries(['/api/entries/:id', '/api/configurations/:id', '/api/shared/:token'].flatMap((base) =>
    ['stl', '3mf', 'dxf', 'svg', 'curve.csv', 'datasheet.pdf'].map((file) => [`GET ${base}/${file}`, 'file' as const]))),
  'GET /api/reports/:id/file': 'file',
  'GET /api/reports/:id/photo': 'file',
  'GET /api/compare/csv': 'file',
  'GET /api/compare/pdf': 'file',
  'GET /api/audit/csv': 'file',
  'GET /api/searches/:id/events': 'event-stream',
  'GET /api/auth/oidc/start': 'redirect',
  'GET /api/auth/oidc/callback': 'redirect',
  'POST /api/auth/signout': 'empty',
  'POST /api/auth/password': 'empty',
  'POST /api/auth/password-reset/confirm': 'empty',
  'DELETE /api/searches/:id': 'empty',
  'DELETE /api/configurations/:id': 'empty',
  'DELETE /api/configurations/:id/share': 'empty',
}

/** Routes whose failure is not ErrorBody: readiness answers 503 with the same body, naming the failed check. */
export const failureContract: Readonly<Record<string, z.ZodType>> = {
  'GET /api/ready': readiness,
}

// ── the catalog's types, pinned ──────────────────────────────────────────────────────
// Each schema above that describes a catalog type must agree with it both ways.
void (true satisfies Same<z.infer<typeof ParamSpecSchema>, ParamSpec>)
void (true satisfies Same<z.infer<typeof MetricSpecSchema>, MetricSpec>)
void (true satisfies Same<z.infer<typeof CurveSchema>, Curve>)
void (true satisfies Same<z.infer<typeof EvaluationSchema>, Evaluation>)
void (true satisfies Same<z.infer<typeof ForceWindowSchema>, ForceWindow>)
void (true satisfies Same<z.infer<typeof JudgementSchema>, Judgement>)
void (true satisfies Same<z.infer<typeof PrintabilityReportSchema>, PrintabilityReport>)
void (true satisfies Same<z.infer<typeof ShelfEntrySchema>, ShelfEntry>)
void (true satisfies Same<z.infer<typeof ConfirmationSchema>, Confirmation>)
void (true satisfies Same<z.infer<typeof SearchResultSchema>, SearchResult>)
void (true satisfies Same<z.infer<typeof CatalogSearchAnswer>, SearchAnswer>)
