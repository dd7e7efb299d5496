/** Pure pieces of the proposal form: the body it sends and where each server issue is shown. */
import type { FieldIssue } from '@/api'
import type { DraftBody, EntryDetail } from '@/api/curation'
import type { ParamSpec } from '@/api/types'
import { evaluationParams, type ParamFormModel } from './paramForm'
import { rangesBody, type RangeModel } from './rangeEditor'

export interface AboutModel {
  name: string
  summary: string
  tags: string[]
  materials: string[]
  notes: string
}

export function aboutOf(entry: Pick<EntryDetail, 'name' | 'summary' | 'tags' | 'materials' | 'notes'> | null): AboutModel {
  return {
    name: entry?.name ?? '',
    summary: entry?.summary ?? '',
    tags: [...(entry?.tags ?? [])],
    materials: [...(entry?.materials ?? [])],
    notes: entry?.notes ?? '',
  }
}

export function draftBody(params: readonly ParamSpec[], about: AboutModel, form: ParamFormModel, ranges: RangeModel): DraftBody {
  return {
    name: about.name.trim(),
    summary: about.summary.trim(),
    tags: [...new Set(about.tags.map((t) => t.trim()).filter(Boolean))],
    defaultParams: evaluationParams(form),
    ranges: rangesBody(params, ranges),
    materials: [...about.materials],
    notes: about.notes.trim(),
  }
}

export interface DraftIssues {
  /** `name`, `summary`, `tags`, `materials`, `notes`, `family` */
  about: Record<string, string>
  /** By parameter key (and `material`), for the default-parameter form. */
  params: Record<string, string>
  /** `ranges.<key>` and `defaultParams.<key>`, for the range editor rows. */
  ranges: Record<string, string>
  /** Anything that names no single field. */
  general: string[]
}

/** The server prefixes a message with its field ("ranges.span: …"); under the field that is said already. */
export function withoutFieldPrefix(issue: FieldIssue): string {
  const prefix = `${issue.field}: `
  return issue.message.startsWith(prefix) ? issue.message.slice(prefix.length) : issue.message
}

const ABOUT = ['name', 'summary', 'tags', 'materials', 'notes', 'family']

function add(map: Record<string, string>, key: string, message: string) {
  map[key] = map[key] ? `${map[key]} ${message}` : message
}

/** Sorts issues (the server's or the range editor's) to the place on the form that shows them. */
export function sortDraftIssues(issues: readonly FieldIssue[], paramKeys: readonly string[]): DraftIssues {
  const out: DraftIssues = { about: {}, params: {}, ranges: {}, general: [] }
  for (const issue of issues) {
    const text = withoutFieldPrefix(issue)
    const [head, rest] = [issue.field.split('.')[0], issue.field.split('.').slice(1).join('.')]
    if (ABOUT.includes(head)) add(out.about, head, issue.message)
    else if (head === 'ranges' && paramKeys.includes(rest)) add(out.ranges, issue.field, text)
    else if (head === 'defaultParams' && (paramKeys.includes(rest) || rest === 'material')) add(out.params, rest, text)
    else out.general.push(issue.message)
  }
  return out
}

/** Why a proposal cannot be edited here, or null when its owner may edit it. */
export function lockReason(entry: Pick<EntryDetail, 'status' | 'owner'> | null, userId: number | null): string | null {
  if (!entry) return null
  if (entry.owner?.id !== userId) return 'Only the contributor who wrote this proposal can edit it.'
  switch (entry.status) {
    case 'draft': return null
    case 'in_review': return 'Submitted for review: a librarian will release it, send it back with a request for changes, or reject it.'
    case 'rejected': return 'A librarian rejected this proposal; it stays here for the record.'
    case 'merged': return 'Released as the next revision of the entry it proposed a change for.'
    case 'released': return 'Released: it is on the shelf. Changes now go through a change proposal.'
    case 'retired': return 'Retired: it stays readable but is hidden from search.'
  }
}
