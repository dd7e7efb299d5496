/** One problem with one input field; `field` is the parameter key (or a dotted path). */
export interface FieldIssue {
  field: string
  message: string
}

/** Input outside the schema: carries one message per bad field. */
export class ValidationError extends Error {
  readonly issues: FieldIssue[]
  constructor(issues: FieldIssue[]) {
    super(issues.map((i) => `${i.field}: ${i.message}`).join('; '))
    this.name = 'ValidationError'
    this.issues = issues
  }
}

/** The solver could not follow the equilibrium path; never replaced by a guessed curve. */
export class SolverError extends Error {
  readonly details: Record<string, unknown>
  constructor(message: string, details: Record<string, unknown> = {}) {
    super(message)
    this.name = 'SolverError'
    this.details = details
  }
}
