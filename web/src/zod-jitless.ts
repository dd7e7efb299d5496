/**
 * zod probes for eval (new Function) to compile its parsers, which the app's content
 * security policy forbids (script-src 'self', api/middleware/security-headers.ts); jitless
 * keeps the catalog's schemas interpreted and the console free of violations. Imported first
 * by the page (main.ts) and by every worker that validates with the catalog.
 */
import { z } from 'zod'

z.config({ jitless: true })
