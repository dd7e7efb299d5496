/**
 * Flexshelf command line: the only part of catalog/ that touches the outside world.
 *   flexshelf evaluate <familyId> '<params JSON>' [--method <id>]
 *   flexshelf stl <familyId> '<params JSON>' -o part.stl
 *   flexshelf 3mf|dxf|svg <familyId> '<params JSON>' -o part.3mf [--name "<object name>"]
 *   flexshelf families
 *   flexshelf search '<force window JSON>' [--shelf shelf.json]
 * JSON goes to stdout; bad input prints one line per problem on stderr and exits 1.
 */
import { readFileSync, writeFileSync } from 'node:fs'
import { buildGeometry, buildPartFile, evaluate, families, getFamily, PART_FORMATS, serializeStl, type PartFormat, SolverError, UnknownFamilyError, ValidationError } from './index'
import { DEMO_SHELF, searchShelfSync, type Shelf } from './search'

const USAGE = `usage:
  flexshelf evaluate <familyId> '<params as JSON>' [--method <method>]
  flexshelf stl <familyId> '<params as JSON>' -o <file.stl>
  flexshelf 3mf|dxf|svg <familyId> '<params as JSON>' -o <file> [--name "<object name>"]
  flexshelf families
  flexshelf search '<force window as JSON>' [--shelf <shelf.json>]
families: ${families.map((f) => f.id).join(', ')}`

class UsageError extends Error {}

function parseJson(text: string | undefined, what: string): unknown {
  if (text === undefined) return {}
  try {
    return JSON.parse(text)
  } catch (e) {
    throw new UsageError(`${what} is not valid JSON: ${(e as Error).message}`)
  }
}

function takeOption(args: string[], names: string[]): string | undefined {
  const i = args.findIndex((a) => names.includes(a))
  if (i < 0) return undefined
  const value = args[i + 1]
  if (value === undefined || value.startsWith('-')) throw new UsageError(`${args[i]} needs a value`)
  args.splice(i, 2)
  return value
}

/** A shelf file: a JSON list of entries, or { "entries": [...] } as the server exports it. */
function readShelf(file: string): Shelf {
  let text: string
  try {
    text = readFileSync(file, 'utf8')
  } catch (e) {
    throw new UsageError(`cannot read the shelf file ${file}: ${(e as Error).message}`)
  }
  const data = parseJson(text, `shelf file ${file}`) as { entries?: unknown } | unknown[]
  const entries = Array.isArray(data) ? data : (data as { entries?: unknown }).entries
  if (!Array.isArray(entries)) throw new UsageError(`shelf file ${file} must hold a list of entries or { "entries": [...] }`)
  entries.forEach((e, i) => {
    const ok = e && typeof e === 'object' && typeof e.familyId === 'string' && typeof e.name === 'string' && e.ranges && typeof e.ranges === 'object' && Array.isArray(e.materials)
    if (!ok) throw new UsageError(`shelf file ${file}: entry ${i} needs familyId, name, ranges and materials`)
    for (const [key, range] of Object.entries(e.ranges as Record<string, unknown>)) {
      const pair = Array.isArray(range) && range.length === 2 && range.every((v) => typeof v === 'number' && Number.isFinite(v)) && range[0] <= range[1]
      if (!pair) throw new UsageError(`shelf file ${file}: entry ${i} ("${e.name}") ranges.${key} must be a [min, max] pair of numbers with min ≤ max, got ${JSON.stringify(range)}`)
    }
  })
  return entries.map((e, i) => ({ id: i + 1, summary: '', tags: [], defaultParams: {}, status: 'released', ...e })) as Shelf
}

export async function main(argv: string[], out = process.stdout, err = process.stderr): Promise<number> {
  const args = [...argv]
  try {
    const command = args.shift()
    if (command === 'evaluate') {
      const method = takeOption(args, ['--method', '-m'])
      const [familyId, json] = args
      if (!familyId) throw new UsageError('evaluate needs a family id')
      const result = evaluate(familyId, parseJson(json, 'params'), { method })
      out.write(JSON.stringify(result, null, 2) + '\n')
      return 0
    }
    if (command === 'stl') {
      const file = takeOption(args, ['-o', '--output'])
      const [familyId, json] = args
      if (!familyId) throw new UsageError('stl needs a family id')
      if (!file) throw new UsageError('stl needs an output file: -o part.stl')
      const bytes = serializeStl(buildGeometry(familyId, parseJson(json, 'params')))
      writeFileSync(file, bytes)
      err.write(`wrote ${file} (${bytes.byteLength} bytes, ${(bytes.byteLength - 84) / 50} triangles)\n`)
      return 0
    }
    if (command && command in PART_FORMATS) {
      const format = command as PartFormat
      const file = takeOption(args, ['-o', '--output'])
      const name = takeOption(args, ['--name', '-n'])
      const [familyId, json] = args
      if (!familyId) throw new UsageError(`${format} needs a family id`)
      if (!file) throw new UsageError(`${format} needs an output file: -o part.${PART_FORMATS[format].extension}`)
      const data = buildPartFile(format, familyId, parseJson(json, 'params'), { name: name ?? getFamily(familyId).name })
      writeFileSync(file, data)
      err.write(`wrote ${file} (${typeof data === 'string' ? Buffer.byteLength(data) : data.byteLength} bytes)\n`)
      return 0
    }
    if (command === 'search') {
      const shelfFile = takeOption(args, ['--shelf', '-s'])
      const [json] = args
      if (!json) throw new UsageError('search needs a force window as JSON')
      const window = parseJson(json, 'force window')
      const shelf = shelfFile ? readShelf(shelfFile) : DEMO_SHELF
      out.write(JSON.stringify(searchShelfSync(window, shelf), null, 2) + '\n')
      return 0
    }
    if (command === 'families') {
      out.write(JSON.stringify(families.map((f) => ({ id: f.id, name: f.name, kind: f.kind, methods: f.methods.map((m) => m.id) })), null, 2) + '\n')
      return 0
    }
    throw new UsageError(command ? `unknown command "${command}"` : 'no command given')
  } catch (e) {
    if (e instanceof ValidationError) {
      for (const issue of e.issues) err.write(`${issue.field}: ${issue.message}\n`)
    } else if (e instanceof UsageError) {
      err.write(`${e.message}\n${USAGE}\n`)
    } else if (e instanceof UnknownFamilyError || e instanceof SolverError) {
      err.write(`${e.message}\n`)
    } else {
      err.write(`unexpected error: ${(e as Error).stack ?? String(e)}\n`)
    }
    return 1
  }
}

// Run only when executed directly, so tests can import main().
if (process.argv[1] && /cli\.[tj]s$/.test(process.argv[1])) {
  main(process.argv.slice(2)).then((code) => { process.exitCode = code })
}
