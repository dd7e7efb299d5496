/** Each route declares the lowest role it is open to; the mark lets tests read it back. */
import type { NextFunction, Request, RequestHandler, Response } from 'express'
import { forbidden, unauthenticated } from '../errors'
import { hasRole, type Role } from '../roles'

export type RoleGate = RequestHandler & { minimumRole: Role | 'public' }

/** The route pattern for the request log and metrics (a gate runs inside every route). */
function markRoute(req: Request, res: Response): void {
  if (req.route?.path && typeof req.route.path === 'string') res.locals.route = req.baseUrl + (req.route.path === '/' ? '' : req.route.path)
}

export function allow(minimum: Role): RoleGate {
  const gate = function requireRole(req: Request, res: Response, next: NextFunction) {
    markRoute(req, res)
    if (!req.auth) return next(unauthenticated())
    if (!hasRole(req.auth.user.role, minimum)) return next(forbidden(`this needs the ${minimum} role or higher`))
    next()
  } as RoleGate
  gate.minimumRole = minimum
  return gate
}

/** Marks a route on the public list (see PUBLIC_ROUTES in authenticate.ts). */
export function allowAnyone(): RoleGate {
  const gate = function publicRoute(req: Request, res: Response, next: NextFunction) {
    markRoute(req, res)
    next()
  } as RoleGate
  gate.minimumRole = 'public'
  return gate
}
