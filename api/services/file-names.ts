/**
 * Download file names that say what the file is:
 *   <entry slug>-<family id>-<dimension><value>-….<ext>
 *   power-switch-field-node-shell-bistable-beam-span60-ah2.1-t0.7-depth6-pl0.stl
 * Only a–z, 0–9, '-' and '.' appear, so the name is safe in a header and on every file system.
 */
import type { FamilyDefinition } from '../../catalog'

/** Longest entry slug kept in a file name (cut at a word boundary). */
const MAX_ENTRY_SLUG = 32

export function slugify(text: string, max = MAX_ENTRY_SLUG): string {
  const slug = text
    .normalize('NFKD')
    .replace(/[\u0300-\u036f]/g, '')
    .toLowerCase()
    .replace(/[^a-z0-9]+/g, '-')
    .replace(/^-+|-+$/g, '')
  if (slug.length <= max) return slug || 'entry'
  const cut = slug.slice(0, max + 1)
  const atWord = cut.lastIndexOf('-')
  return (atWord > 0 ? cut.slice(0, atWord) : slug.slice(0, max)).replace(/-+$/, '') || 'entry'
}

/**
 * Short name of a parameter in a file name: a one-word key of up to six letters stays as it
 * is (span, depth, pitch), a longer one-word key keeps its first letter (thickness → t), a
 * camelCase key keeps its initials (apexHeight → ah). A clash inside a family falls back to
 * the whole key.
 */
export function dimensionAbbreviations(family: FamilyDefinition): Record<string, string> {
  const short = (key: string) => {
    const words = key.split(/(?=[A-Z])/)
    if (words.length > 1) return words.map((w) => w[0].toLowerCase()).join('')
    return key.length <= 6 ? key.toLowerCase() : key[0].toLowerCase()
  }
  const proposed = family.params.map((p) => [p.key, short(p.key)] as const)
  const out: Record<string, string> = {}
  for (const [key, abbrev] of proposed) {
    const clashes = proposed.filter(([, a]) => a === abbrev).length > 1
    out[key] = clashes ? key.toLowerCase() : abbrev
  }
  return out
}

function formatValue(v: number): string {
  const text = String(Number(v.toPrecision(6)))
  return text.replace(/^-/, 'm').replace(/e\+?/, 'e').replace(/[^a-z0-9.]/g, '')
}

/** `<entry slug>-<family>-<dims>.<ext>`; `suffix` names the kind of file (`curve`, `datasheet`). */
export function downloadFileName(entryName: string, family: FamilyDefinition, params: Record<string, number | string>, ext: string, suffix?: string): string {
  const abbreviations = dimensionAbbreviations(family)
  const dims = family.params
    .filter((p) => typeof params[p.key] === 'number')
    .map((p) => `${abbreviations[p.key]}${formatValue(params[p.key] as number)}`)
  const parts = [slugify(entryName), family.id, ...dims]
  if (suffix) parts.push(suffix)
  return `${parts.join('-')}.${ext}`
}
