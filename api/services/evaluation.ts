/**
 * Evaluation through the engineering core, with material ids resolved to the curated
 * numbers in the database (a librarian's calibrated PETG wins over the built-in one).
 */
import { z } from 'zod'
import type { Evaluation } from '../../catalog'
import type { AppContext } from '../context'
import { bodySchema, parseBody } from '../validation'
import { compute } from './compute-pool'
import { findFamily } from './families'
import { listMaterials } from './materials'

const evaluateBody = bodySchema({
  params: z.record(z.string(), z.unknown(), { error: 'params must be a JSON object of parameter values' }).optional(),
  method: z.string({ error: 'method must be text (a method id of the family)' }).min(1, 'method must not be empty').max(64).optional(),
})

export async function evaluateFamily(context: AppContext, familyId: string, body: unknown): Promise<Evaluation> {
  const family = findFamily(familyId)
  const input = parseBody(evaluateBody, body)
  const materials = await listMaterials(context)
  // a nonlinear evaluation takes tens of milliseconds: on the compute pool, off the request thread
  return compute.evaluate(family.id, input.params ?? {}, { method: input.method, materials })
}

