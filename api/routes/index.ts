import type { Router } from 'express'
import type { AppContext } from '../context'
import { accountRouter } from './account'
import { auditRouter } from './audit'
import { authRouter } from './auth'
import { compareRouter } from './compare'
import { configurationsRouter, sharedRouter } from './configurations'
import { configureRouter } from './configure'
import { curationRouter } from './curation'
import { entriesRouter } from './entries'
import { familiesRouter } from './families'
import { healthRouter } from './health'
import { materialsRouter } from './materials'
import { oidcRouter } from './oidc'
import { outboxRouter } from './outbox'
import { readyRouter } from './ready'
import { entryReportsRouter, reportsRouter } from './reports'
import { reviewQueueRouter } from './review-queue'
import { searchesRouter, searchRouter } from './search'
import { shelfRouter } from './shelf'
import { usersRouter } from './users'

/** Every resource router and where it is mounted (relative to /api). */
export function apiRouters(context: AppContext): Array<{ path: string; router: Router }> {
  return [
    { path: '/health', router: healthRouter(context) },
    { path: '/ready', router: readyRouter(context) },
    { path: '/auth', router: authRouter(context) },
    { path: '/auth', router: accountRouter(context) },
    { path: '/auth/oidc', router: oidcRouter(context) },
    { path: '/users', router: usersRouter(context) },
    { path: '/families', router: familiesRouter(context) },
    { path: '/materials', router: materialsRouter(context) },
    { path: '/entries', router: entriesRouter(context) },
    { path: '/entries', router: configureRouter(context) },
    { path: '/configurations', router: configurationsRouter(context) },
    { path: '/shared', router: sharedRouter(context) },
    { path: '/entries', router: curationRouter(context) },
    { path: '/entries', router: entryReportsRouter(context) },
    { path: '/reports', router: reportsRouter(context) },
    { path: '/review-queue', router: reviewQueueRouter(context) },
    { path: '/outbox', router: outboxRouter(context) },
    { path: '/shelf', router: shelfRouter(context) },
    { path: '/search', router: searchRouter(context) },
    { path: '/compare', router: compareRouter(context) },
    { path: '/searches', router: searchesRouter(context) },
    { path: '/audit', router: auditRouter(context) },
  ]
}
