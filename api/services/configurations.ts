/**
 * Saved configurations: an engineer's named configuration of an entry, remembered with the
 * entry revision it was made from; private to its owner (anyone else gets 404, so ids do not
 * reveal what others saved) unless shared by an unguessable link token, which gives any
 * signed-in user a read-only view and the downloads.
 */
import { randomBytes } from 'node:crypto'
import { z } from 'zod'
import { validateParams } from '../../catalog'
import type { AppContext } from '../context'
import type { Entry, EntryRevision, SavedConfiguration, User } from '../db'
import { HttpError, notFound, type FieldIssue } from '../errors'
import { bodySchema, parseBody, textField } from '../validation'
import { recordAudit } from './audit'
import { configurationShape, type RawConfiguration } from './configuration-input'
import { configureTarget, loadEntry, resolveFor, type ConfigureTarget } from './configure'
import { visibleTo } from './entries'

const createBody = bodySchema({
  entryId: z.number({ error: 'entryId must be the id (a number) of a shelf entry' }).int('entryId must be a whole number').positive('entryId must be a whole number above 0'),
  name: textField('name', 120),
  ...configurationShape,
})

/** Where the web app shows a shared configuration (the API route is /api/shared/:token). */
const sharePath = (token: string) => `/shared/${token}`

type RevisionRef = { id: number; number: number } | null

export interface ConfigurationView {
  id: number
  name: string
  owner: { id: number; displayName: string } | null
  entry: { id: number; name: string; familyId: string; status: string }
  params: Record<string, number | string>
  method: string | null
  window: Record<string, unknown> | null
  tolerance: { thickness: number; modulus: number } | null
  printer: { nozzle?: number; layer?: number } | null
  savedRevision: RevisionRef
  currentRevision: RevisionRef
  /** True when the entry has a newer current revision than the one this was saved from. */
  revisionChanged: boolean
  /** The link token and the web path of the shared view; owners only, null when not shared. */
  shareToken: string | null
  shareUrl: string | null
  /** True when read through a share link (nothing can be changed through it). */
  readOnly: boolean
  /**
   * Saved values the checks no longer accept (bounds tightened since it was saved, e.g. a
   * printer outside 0.1–2 mm), by field; empty when it checks as saved. Its check and
   * downloads answer 400 naming the same fields until it is saved again with good values.
   */
  problems: FieldIssue[]
  notices: string[]
  createdAt: string
  updatedAt: string
}

interface Loaded {
  configuration: SavedConfiguration & { owner?: User }
  entry: Entry & { currentRevision?: EntryRevision | null }
  savedRevision: EntryRevision | null
}

function revisionRef(revision: Pick<EntryRevision, 'id' | 'number'> | null | undefined): RevisionRef {
  return revision ? { id: revision.id, number: revision.number } : null
}

function revisionNotice(saved: RevisionRef, current: RevisionRef): string | null {
  if (!current || (saved && saved.id === current.id)) return null
  const from = saved ? `revision ${saved.number}` : 'before its first revision'
  return `The entry has moved on to revision ${current.number} since this configuration was saved (${from}); this configuration keeps its saved parameters and the allowed ranges it was saved under.`
}

/** Said on a configuration whose saved values are no longer accepted. */
const OUT_OF_RANGE_NOTICE =
  'This configuration was saved with values Flexshelf no longer accepts; correct them in the configurator and save it again:'

/** The saved values' problems under today's checks: empty when they resolve. */
function problemsOf(target: ConfigureTarget, raw: RawConfiguration): FieldIssue[] {
  try {
    resolveFor(target, raw)
    return []
  } catch (err) {
    if (err instanceof HttpError && err.code === 'validation_failed') return (err.details?.issues as FieldIssue[] | undefined) ?? []
    throw err
  }
}

/** The configuration resolved for a check or download; 400 naming every field when its saved values are out of range. */
export function resolveSaved(opened: OpenedConfiguration) {
  try {
    return resolveFor(opened.target, opened.raw)
  } catch (err) {
    if (err instanceof HttpError && err.code === 'validation_failed') {
      throw new HttpError(400, 'validation_failed', `this saved configuration holds values that are no longer accepted: ${err.message}`, err.details)
    }
    throw err
  }
}

function toView(loaded: Loaded, target: ConfigureTarget, readOnly: boolean): ConfigurationView {
  const { configuration: c, entry, savedRevision } = loaded
  const problems = problemsOf(target, rawOf(c))
  const saved = revisionRef(savedRevision)
  const current = revisionRef(entry.currentRevision)
  return {
    id: c.id,
    name: c.name,
    owner: c.owner ? { id: c.owner.id, displayName: c.owner.displayName } : null,
    entry: { id: entry.id, name: entry.name, familyId: entry.familyId, status: entry.status },
    params: c.params,
    method: c.method,
    window: c.window,
    tolerance: c.tolerance,
    printer: c.printer,
    savedRevision: saved,
    currentRevision: current,
    revisionChanged: current !== null && saved?.id !== current.id,
    shareToken: readOnly ? null : c.shareToken,
    shareUrl: readOnly || !c.shareToken ? null : sharePath(c.shareToken),
    readOnly,
    problems,
    notices: problems.length ? [...target.notices, `${OUT_OF_RANGE_NOTICE} ${problems.map((p) => p.message).join('; ')}.`] : target.notices,
    createdAt: c.createdAt.toISOString(),
    updatedAt: c.updatedAt.toISOString(),
  }
}

async function loadParts(context: AppContext, configuration: SavedConfiguration & { owner?: User }, viewer: User, asOwner: boolean): Promise<Loaded> {
  const { Entry, EntryRevision } = context.db.models
  // an owner keeps their configurations whatever happens to the entry's visibility; a shared
  // link shows only entries the viewer may see anyway
  const where = asOwner ? { id: configuration.entryId } : { id: configuration.entryId, ...visibleTo(viewer) }
  const entry = await Entry.findOne({ where, include: [{ model: EntryRevision, as: 'currentRevision', attributes: ['id', 'number', 'ranges'] }] })
  if (!entry) throw notFound('configuration')
  const savedRevision = configuration.revisionId ? await EntryRevision.findByPk(configuration.revisionId) : null
  return { configuration, entry, savedRevision }
}

/**
 * What downloads and checks of a saved configuration compute against: the ranges of the
 * revision it was saved from (so a later narrowing does not lock it out), every notice.
 */
async function targetOf(context: AppContext, loaded: Loaded): Promise<ConfigureTarget> {
  const live = await configureTarget(context, loaded.entry)
  const notice = revisionNotice(revisionRef(loaded.savedRevision), revisionRef(loaded.entry.currentRevision))
  return {
    ...live,
    ranges: loaded.savedRevision?.ranges ?? loaded.entry.ranges,
    // stored complete and checked against the entry's materials when it was saved
    defaults: {},
    releasedMaterials: [],
    notices: notice ? [...live.notices, notice] : live.notices,
  }
}

function rawOf(c: SavedConfiguration): RawConfiguration {
  return { params: c.params, method: c.method ?? undefined, window: c.window ?? undefined, tolerance: c.tolerance ?? undefined, printer: c.printer ?? undefined }
}

export interface OpenedConfiguration {
  view: ConfigurationView
  target: ConfigureTarget
  raw: RawConfiguration
}

async function open(context: AppContext, configuration: SavedConfiguration & { owner?: User }, viewer: User, readOnly: boolean): Promise<OpenedConfiguration> {
  const loaded = await loadParts(context, configuration, viewer, !readOnly)
  const target = await targetOf(context, loaded)
  return { view: toView(loaded, target, readOnly), target, raw: rawOf(configuration) }
}

const ownerInclude = (context: AppContext) => [{ model: context.db.models.User, as: 'owner', attributes: ['id', 'displayName'] }]

export function parseConfigurationId(raw: string): number {
  const id = Number(raw)
  if (!/^\d{1,15}$/.test(raw) || !Number.isSafeInteger(id)) throw notFound('configuration')
  return id
}

/** The viewer's own configuration; 404 for a missing one and for anyone else's. */
export async function openOwn(context: AppContext, viewer: User, id: number): Promise<OpenedConfiguration> {
  const configuration = await context.db.models.SavedConfiguration.findOne({ where: { id, ownerId: viewer.id }, include: ownerInclude(context) })
  if (!configuration) throw notFound('configuration')
  return open(context, configuration, viewer, false)
}

/** A configuration by its share token, read-only; 404 for an unknown or withdrawn token. */
export async function openShared(context: AppContext, viewer: User, token: string): Promise<OpenedConfiguration> {
  if (!/^[A-Za-z0-9_-]{20,64}$/.test(token)) throw notFound('shared configuration')
  const configuration = await context.db.models.SavedConfiguration.findOne({ where: { shareToken: token }, include: ownerInclude(context) })
  if (!configuration) throw notFound('shared configuration')
  return open(context, configuration, viewer, true)
}

export async function listOwn(context: AppContext, viewer: User): Promise<ConfigurationView[]> {
  const configurations = await context.db.models.SavedConfiguration.findAll({
    where: { ownerId: viewer.id }, include: ownerInclude(context), order: [['updatedAt', 'DESC'], ['id', 'DESC']],
  })
  const views: ConfigurationView[] = []
  for (const c of configurations) views.push((await open(context, c, viewer, false)).view)
  return views
}

export async function createConfiguration(context: AppContext, viewer: User, body: unknown): Promise<ConfigurationView> {
  const input = parseBody(createBody, body)
  const entry = await loadEntry(context, viewer, input.entryId)
  const target = await configureTarget(context, entry)
  const resolved = resolveFor(target, input)
  // stored complete, so a later change of the entry's defaults does not change what was saved
  const { echo } = validateParams(target.family, resolved.params, { ranges: target.ranges, materials: target.materials })
  const { SavedConfiguration } = context.db.models
  const id = await context.db.write(async (transaction) => {
    const created = await SavedConfiguration.create({
      ownerId: viewer.id, entryId: entry.id, revisionId: entry.currentRevisionId ?? null, name: input.name, params: echo,
      window: resolved.window as unknown as SavedConfiguration['window'], method: resolved.method, tolerance: resolved.tolerance,
      printer: resolved.printer, shareToken: null,
    }, { transaction })
    await recordAudit(context, transaction, {
      actorId: viewer.id, action: 'configuration.created', subjectType: 'configuration', subjectId: created.id,
      details: { name: input.name, entryId: entry.id, revisionId: entry.currentRevisionId ?? null },
    })
    return created.id
  })
  return (await openOwn(context, viewer, id)).view
}

export async function deleteConfiguration(context: AppContext, viewer: User, id: number): Promise<void> {
  await context.db.write(async (transaction) => {
    const configuration = await context.db.models.SavedConfiguration.findOne({ where: { id, ownerId: viewer.id }, transaction })
    if (!configuration) throw notFound('configuration')
    await configuration.destroy({ transaction })
    await recordAudit(context, transaction, {
      actorId: viewer.id, action: 'configuration.deleted', subjectType: 'configuration', subjectId: id,
      details: { name: configuration.name, entryId: configuration.entryId },
    })
  })
}

/** 24 random bytes (192 bits) as base64url: 32 characters nobody guesses. */
export function newShareToken(): string {
  return randomBytes(24).toString('base64url')
}

/** Shares the configuration (the same token again when it is shared already). */
export async function shareConfiguration(context: AppContext, viewer: User, id: number): Promise<{ shareToken: string; url: string }> {
  const token = await context.db.write(async (transaction) => {
    const configuration = await context.db.models.SavedConfiguration.findOne({ where: { id, ownerId: viewer.id }, transaction })
    if (!configuration) throw notFound('configuration')
    if (configuration.shareToken) return configuration.shareToken
    const shareToken = newShareToken()
    await configuration.update({ shareToken }, { transaction })
    await recordAudit(context, transaction, {
      actorId: viewer.id, action: 'configuration.shared', subjectType: 'configuration', subjectId: id, details: { name: configuration.name, entryId: configuration.entryId },
    })
    return shareToken
  })
  return { shareToken: token, url: sharePath(token) }
}

/** Withdraws the share link; the old token answers 404 from then on. */
export async function unshareConfiguration(context: AppContext, viewer: User, id: number): Promise<void> {
  await context.db.write(async (transaction) => {
    const configuration = await context.db.models.SavedConfiguration.findOne({ where: { id, ownerId: viewer.id }, transaction })
    if (!configuration) throw notFound('configuration')
    if (!configuration.shareToken) return
    await configuration.update({ shareToken: null }, { transaction })
    await recordAudit(context, transaction, {
      actorId: viewer.id, action: 'configuration.unshared', subjectType: 'configuration', subjectId: id, details: { name: configuration.name, entryId: configuration.entryId },
    })
  })
}
