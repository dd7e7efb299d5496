/**
 * Holds one API answer to the wire contract: a failure answers ErrorBody, a success answers its
 * route's schema, and a JSON route without a row in `responseContract` is itself a violation,
 * so a new route cannot skip the contract.
 */
import type { z } from 'zod'
import { ErrorBody, failureContract, responseContract } from './api'

export class ContractViolation extends Error {
  constructor(readonly route: string, readonly status: number, readonly issues: string[]) {
    super(`${route} answered ${status} outside the wire contract: ${issues.join('; ')}`)
    this.name = 'ContractViolation'
  }
}

function issuesOf(error: z.ZodError): string[] {
  return error.issues.slice(0, 8).map((i) => `${i.path.join('.') || '(body)'}: ${i.message}`)
}

export function checkResponse(route: string, status: number, body: unknown): void {
  const schema = status >= 400 ? failureContract[route] ?? ErrorBody : (responseContract as Record<string, z.ZodType | undefined>)[route]
  if (!schema) throw new ContractViolation(route, status, ['no schema for this route in contract/api.ts responseContract'])
  const parsed = schema.safeParse(body)
  if (!parsed.success) throw new ContractViolation(route, status, issuesOf(parsed.error))
}
