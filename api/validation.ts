/** Request bodies are checked with zod; every problem becomes one { field, message }. */
import { z } from 'zod'
import { validationFailed, type FieldIssue } from './errors'

export function zodIssues(error: z.ZodError): FieldIssue[] {
  const issues: FieldIssue[] = []
  for (const issue of error.issues) {
    if (issue.code === 'unrecognized_keys') {
      const prefix = issue.path.length ? `${issue.path.join('.')}.` : ''
      for (const key of issue.keys) {
        // an empty key would otherwise read as " is not an accepted field"
        const shown = key === '' ? `${prefix}"" (an empty field name)` : prefix + key
        issues.push({ field: prefix + key, message: `${shown} is not an accepted field` })
      }
    } else {
      const field = issue.path.length ? issue.path.join('.') : 'body'
      issues.push({ field, message: issue.message })
    }
  }
  return issues
}

/** Parses a body with a strict object schema or throws 400 validation_failed. */
export function parseBody<S extends z.ZodType>(schema: S, body: unknown): z.infer<S> {
  const result = schema.safeParse(body ?? {})
  if (!result.success) throw validationFailed(zodIssues(result.error))
  return result.data
}

/** A required string field whose messages name the field. */
export function textField(field: string, max: number) {
  return z
    .string({ error: (iss) => (iss.input === undefined ? `${field} is required` : `${field} must be text`) })
    .trim()
    .min(1, `${field} must not be empty`)
    .max(max, `${field} must be at most ${max} characters`)
}

/** A strict object: unknown fields are refused by name; a non-object body gets one message. */
export function bodySchema<T extends z.ZodRawShape>(shape: T) {
  return z.strictObject(shape, { error: (iss) => (iss.code === 'invalid_type' ? 'the body must be a JSON object' : undefined) })
}
