/**
 * Copies the released entries of the API's demo seed (api/db/demo-shelf.ts) into
 * catalog/search/demo-shelf.json, the CLI's built-in shelf (catalog/ may not import api/).
 * Run `npx tsx scripts/generate-demo-shelf.ts` after changing the seed; a test compares them.
 */
import { writeFileSync } from 'node:fs'
import { fileURLToPath } from 'node:url'
import { DEMO_SHELF } from '../api/db/demo-shelf'

const slug = (s: string) => s.toLowerCase().replace(/[^a-z0-9]+/g, '-').replace(/^-|-$/g, '')
const entries = Object.entries(DEMO_SHELF).flatMap(([familyId, list]) => list
  .filter((e) => e.status === 'released')
  .map((e) => ({ id: `${familyId}/${slug(e.name)}`, familyId, name: e.name, summary: e.summary, tags: e.tags, materials: e.materials, defaultParams: e.defaultParams, ranges: e.ranges, status: e.status })))
const file = fileURLToPath(new URL('../catalog/search/demo-shelf.json', import.meta.url))
writeFileSync(file, JSON.stringify(entries, null, 2) + '\n')
console.log(`wrote ${entries.length} released demo entries to ${file}`)
