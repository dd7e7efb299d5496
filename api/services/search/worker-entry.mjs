// Worker threads do not inherit the parent's TypeScript loader on Node 20, so each search
// thread registers tsx itself, then hands piscina the TypeScript body's task function.
import { register } from 'tsx/esm/api'

register()
const { default: search } = await import('./worker.ts')

export default search
