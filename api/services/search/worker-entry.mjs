// Worker threads do not inherit the parent's TypeScript loader on Node 20, so the search
// worker registers tsx itself before it loads its TypeScript body.
import { register } from 'tsx/esm/api'

register()
await import('./worker.ts')
