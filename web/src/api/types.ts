/** Shapes of the Flexshelf HTTP API (docs/api.md); catalog types are shared with the core. */
import type { AxisSpec, Curve, Evaluation, MethodInfo, MetricSpec, MetricValue, ModuleKind, ParamSpec } from '@catalog/schema/types'

export type { AxisSpec, Curve, Evaluation, MethodInfo, MetricSpec, MetricValue, ModuleKind, ParamSpec }

export type Role = 'engineer' | 'contributor' | 'librarian' | 'admin'
export type GrantableRole = Exclude<Role, 'admin'>

export interface User {
  id: number
  email: string
  displayName: string
  role: Role
  createdAt: string
  /** False for an account that signs in only through single sign-on. */
  hasPassword?: boolean
  /** A one-time password is in use; the person must choose their own first. */
  mustChangePassword?: boolean
  sso?: boolean
}

/** What the sign-in screen offers (GET /api/auth/options). */
export interface SigninOptions {
  passwordSignin: boolean
  signup: { open: boolean; domains: string[] }
  sso: { name: string } | null
}

export interface Session {
  token: string
  user: User
}

/** A family as the API sends it: the catalog definition without its functions. */
export interface Family {
  id: string
  name: string
  kind: ModuleKind
  summary: string
  params: ParamSpec[]
  rules: Array<{ fields: string[] }>
  methods: MethodInfo[]
  defaultMethod: string
  metrics: MetricSpec[]
  axes: { displacement: AxisSpec; force: AxisSpec }
  cautions: string[]
  /** The two parameters the design map sweeps first (x across, y up), or null for the map's own choice. */
  designMap: { sweep: readonly [string, string] } | null
}

export interface Material {
  id: string
  name: string
  process: string
  modulus: number
  strainLimit: number
  density: number
  notes: string
  source: string
}

/** A change proposal that is released becomes `merged` (it lives on as the entry's next revision). */
export type EntryStatus = 'draft' | 'in_review' | 'released' | 'retired' | 'rejected' | 'merged'

export interface PersonRef {
  id: number
  displayName: string
}

export interface EntrySummary {
  id: number
  familyId: string
  /** The family's name, or its id when the family is no longer registered. */
  familyName: string
  /** null when the family is no longer registered. */
  kind: ModuleKind | null
  name: string
  summary: string
  tags: string[]
  status: EntryStatus
  owner: PersonRef
  currentRevision: { id: number; number: number; metrics: Record<string, MetricValue> } | null
  updatedAt: string
}

export type ParamRanges = Record<string, [number, number]>

export interface Revision {
  id: number
  number: number
  createdAt: string
  createdBy: PersonRef
  params: Record<string, number | string>
  ranges: ParamRanges
  method: string
  curve: Curve
  metrics: Record<string, MetricValue>
  warnings: string[]
}

export interface Entry extends EntrySummary {
  defaultParams: Record<string, number | string>
  ranges: ParamRanges
  materials: string[]
  notes: string
  revisions: Revision[]
  reports: unknown[]
}

export interface EvaluateRequest {
  params: Record<string, number | string>
  method?: string
}
