/**
 * A JSON body nested deeper than any route takes is refused right after parsing, before any
 * route, validator or worker sees it: zod, structured cloning to a worker thread and other
 * recursive walks overflow the stack on a body nested 40,000 deep (issue 11), which used to
 * answer 500. The walk here is iterative, so it cannot overflow itself.
 */
import type { NextFunction, Request, Response } from 'express'
import { HttpError } from '../errors'

/** Deepest nesting any route's body has is about 5 (window.peakForce.min); 32 leaves room. */
const MAX_BODY_DEPTH = 32

/** The nesting depth of a parsed JSON value, stopping as soon as it passes `limit`. */
function jsonDepth(value: unknown, limit = MAX_BODY_DEPTH): number {
  let deepest = 0
  const stack: Array<[unknown, number]> = [[value, 0]]
  while (stack.length) {
    const [node, depth] = stack.pop()!
    if (node === null || typeof node !== 'object') continue
    const level = depth + 1
    if (level > deepest) deepest = level
    if (deepest > limit) return deepest
    for (const child of Array.isArray(node) ? node : Object.values(node)) if (child !== null && typeof child === 'object') stack.push([child, level])
  }
  return deepest
}

export function bodyDepth(limit = MAX_BODY_DEPTH) {
  return function checkBodyDepth(req: Request, _res: Response, next: NextFunction) {
    if (req.body !== null && typeof req.body === 'object' && jsonDepth(req.body, limit) > limit) {
      return next(new HttpError(400, 'validation_failed', `the request body is nested more than ${limit} levels deep; no request needs that many`, {
        issues: [{ field: 'body', message: `the request body is nested more than ${limit} levels deep` }],
      }))
    }
    next()
  }
}
