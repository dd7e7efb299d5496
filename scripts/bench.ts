/**
 * Benchmark runner (npm run bench): imports every section in scripts/bench/*.ts and prints it.
 * A section exports `run()` (sync or async) returning table rows (an array of flat records) or
 * any object, and optionally `title` and `format(result) → string`. Add a file to add a
 * section; this runner does not change. `npm run bench -- bistable` runs matching sections only.
 * Benchmarks report medians and assert nothing.
 */
import { readdirSync } from 'node:fs'
import { fileURLToPath, pathToFileURL } from 'node:url'
import { join } from 'node:path'

interface Section {
  run: () => unknown
  title?: string
  format?: (result: never) => string
}

function table(rows: Array<Record<string, unknown>>): string {
  if (!rows.length) return '(no rows)'
  const keys = Object.keys(rows[0])
  const cell = (v: unknown) => (typeof v === 'number' ? (Number.isInteger(v) ? String(v) : Number(v.toPrecision(4)).toString()) : String(v))
  const widths = keys.map((k) => Math.max(k.length, ...rows.map((r) => cell(r[k]).length)))
  const line = (values: string[]) => values.map((v, i) => v.padStart(widths[i])).join('  ')
  return [line(keys), line(widths.map((w) => '-'.repeat(w))), ...rows.map((r) => line(keys.map((k) => cell(r[k]))))].join('\n')
}

async function main(): Promise<void> {
  const dir = fileURLToPath(new URL('./bench/', import.meta.url))
  const filter = process.argv.slice(2)
  const files = readdirSync(dir).filter((f) => f.endsWith('.ts') && (!filter.length || filter.some((w) => f.includes(w)))).sort()
  for (const file of files) {
    const section = (await import(pathToFileURL(join(dir, file)).href)) as Section
    if (typeof section.run !== 'function') continue
    const started = performance.now()
    const result = await section.run()
    console.log(`\n## ${section.title ?? file.replace(/\.ts$/, '')}  (${((performance.now() - started) / 1000).toFixed(1)} s)\n`)
    if (section.format) console.log(section.format(result as never))
    else if (Array.isArray(result)) console.log(table(result as Array<Record<string, unknown>>))
    else console.log(JSON.stringify(result, null, 2))
  }
}

main().catch((e) => { console.error(e); process.exitCode = 1 })
