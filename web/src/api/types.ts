/** Shapes of the Flexshelf HTTP API (docs/api.md); catalog types are shared with the core. */
import type { z } from 'zod'
import type * as contract from '@contract/api'
import type { AxisSpec, Curve, Evaluation, MethodInfo, MetricSpec, MetricValue, ModuleKind, ParamSpec } from '@catalog/schema/types'

export type { AxisSpec, Curve, Evaluation, MethodInfo, MetricSpec, MetricValue, ModuleKind, ParamSpec }

// The API's answers, defined once in the wire contract (contract/api.ts); type-only, so the
// bundle carries no schema.
export type Role = z.infer<typeof contract.Role>
export type Session = z.infer<typeof contract.Session>
/** A family as the API sends it: the catalog definition without its functions. */
export type Family = z.infer<typeof contract.Family>
export type Material = z.infer<typeof contract.Material>
/** A change proposal that is released becomes `merged` (it lives on as the entry's next revision). */
export type EntryStatus = z.infer<typeof contract.EntryStatusSchema>
export type EntrySummary = z.infer<typeof contract.EntrySummary>
export type Revision = z.infer<typeof contract.Revision>

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
export type ParamRanges = Record<string, [number, number]>

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
