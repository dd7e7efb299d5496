/** Ids in query strings (?against=, ?a=, ?b=): whole numbers, or a message naming the field. */
import { validationFailed } from '../../errors'

export function parseQueryId(raw: unknown, field: string): number {
  const text = typeof raw === 'string' ? raw : ''
  const n = Number(text)
  if (!/^\d{1,15}$/.test(text) || !Number.isSafeInteger(n)) {
    throw validationFailed([{ field, message: `${field} must be a revision id (a whole number)` }])
  }
  return n
}
