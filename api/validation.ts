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

/**
 * Characters no name or comment may hold: C0 controls but tab, line feed and carriage return,
 * DEL, C1 controls, and the bidirectional embeddings, overrides and isolates
 * (U+202A–U+202E, U+2066–U+2069), which make text display in another order than it is
 * stored ("Trojan Source", CVE-2021-42574). Names refuse tab, CR and LF as well.
 */
// eslint-disable-next-line no-control-regex
const CONTROL_IN_PROSE = /[\u0000-\u0008\u000B\u000C\u000E-\u001F\u007F-\u009F]/
// eslint-disable-next-line no-control-regex
const CONTROL_IN_LINE = /[\u0000-\u001F\u007F-\u009F]/
const BIDI_CONTROL = /[\u202A-\u202E\u2066-\u2069]/

export interface TextRules {
  /** Comments, notes, reasons: line breaks and tabs allowed. Names are one line. */
  multiline?: boolean
}

/** Refuses control characters and bidirectional overrides, naming the field. */
export function plainText<S extends z.ZodString>(schema: S, field: string, rules: TextRules = {}): S {
  const control = rules.multiline ? CONTROL_IN_PROSE : CONTROL_IN_LINE
  const what = rules.multiline ? 'control characters (such as NUL or escape)' : 'control characters (line breaks, tabs, NUL and the like)'
  return schema
    .refine((v) => !control.test(v), { message: `${field} must not contain ${what}` })
    .refine((v) => !BIDI_CONTROL.test(v), { message: `${field} must not contain right-to-left or left-to-right override characters (U+202A–U+202E, U+2066–U+2069)` }) as unknown as S
}

/** A required string field whose messages name the field; one line unless `multiline`. */
export function textField(field: string, max: number, rules: TextRules = {}) {
  return plainText(
    z
      .string({ error: (iss) => (iss.input === undefined ? `${field} is required` : `${field} must be text`) })
      .trim()
      .min(1, `${field} must not be empty`)
      .max(max, `${field} must be at most ${max} characters`),
    field,
    rules,
  )
}

/** An optional string field (may be empty): one line unless `multiline`. */
export function optionalTextField(field: string, max: number, rules: TextRules = {}) {
  return plainText(z.string({ error: `${field} must be text` }).trim().max(max, `${field} must be at most ${max} characters`), field, rules)
}

/** A strict object: unknown fields are refused by name; a non-object body gets one message. */
export function bodySchema<T extends z.ZodRawShape>(shape: T) {
  return z.strictObject(shape, { error: (iss) => (iss.code === 'invalid_type' ? 'the body must be a JSON object' : undefined) })
}
