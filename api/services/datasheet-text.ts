/**
 * Text for the PDF in IBM Plex Sans, which Flexshelf ships through @fontsource. Those files
 * are split by script (latin, latin-ext, greek), so a line is written as runs, each in the
 * file that has its glyphs; the few math signs no file has get plain-text stand-ins.
 * The unicode ranges are those of the package's latin-400.css, latin-ext-400.css, greek-400.css.
 */
import { readFileSync } from 'node:fs'
import { createRequire } from 'node:module'

export type FontKey = 'regular' | 'semibold' | 'latinExt' | 'greek'

const FONT_FILES: Record<FontKey, string> = {
  regular: 'ibm-plex-sans-latin-400-normal.woff',
  semibold: 'ibm-plex-sans-latin-600-normal.woff',
  latinExt: 'ibm-plex-sans-latin-ext-400-normal.woff',
  greek: 'ibm-plex-sans-greek-400-normal.woff',
}

let loaded: Record<FontKey, Buffer> | null = null

/** The font files' bytes, read once. */
export function fontBuffers(): Record<FontKey, Buffer> {
  if (!loaded) {
    const require = createRequire(import.meta.url)
    const read = (file: string) => readFileSync(require.resolve(`@fontsource/ibm-plex-sans/files/${file}`))
    loaded = { regular: read(FONT_FILES.regular), semibold: read(FONT_FILES.semibold), latinExt: read(FONT_FILES.latinExt), greek: read(FONT_FILES.greek) }
  }
  return loaded
}

type Ranges = ReadonlyArray<readonly [number, number]>

const LATIN: Ranges = [[0x0000, 0x00ff], [0x0131, 0x0131], [0x0152, 0x0153], [0x02bb, 0x02bc], [0x02c6, 0x02c6], [0x02da, 0x02da], [0x02dc, 0x02dc], [0x0304, 0x0304], [0x0308, 0x0308], [0x0329, 0x0329], [0x2000, 0x206f], [0x20ac, 0x20ac], [0x2122, 0x2122], [0x2191, 0x2191], [0x2193, 0x2193], [0x2212, 0x2212], [0x2215, 0x2215], [0xfeff, 0xfeff], [0xfffd, 0xfffd]]
const LATIN_EXT: Ranges = [[0x0100, 0x02ba], [0x02bd, 0x02c5], [0x02c7, 0x02cc], [0x02ce, 0x02d7], [0x02dd, 0x02ff], [0x1d00, 0x1dbf], [0x1e00, 0x1e9f], [0x1ef2, 0x1eff], [0x2020, 0x2020], [0x20a0, 0x20ab], [0x20ad, 0x20c0], [0x2113, 0x2113], [0x2c60, 0x2c7f], [0xa720, 0xa7ff]]
const GREEK: Ranges = [[0x0370, 0x0377], [0x037a, 0x037f], [0x0384, 0x038a], [0x038c, 0x038c], [0x038e, 0x03a1], [0x03a3, 0x03ff]]

const STAND_INS: Record<string, string> = {
  '≈': '~', '≤': '<=', '≥': '>=', '≪': '<<', '≫': '>>', '∫': 'integral of ', '√': 'sqrt', '∈': 'in', '→': '->', '∞': 'infinity', '∑': 'sum of ', '∂': 'd',
}

const inside = (ranges: Ranges, cp: number) => ranges.some(([lo, hi]) => cp >= lo && cp <= hi)

function fontFor(cp: number, base: 'regular' | 'semibold'): FontKey | null {
  if (cp < 0x20 && cp !== 0x09) return null
  if (inside(LATIN, cp)) return base
  if (inside(GREEK, cp)) return 'greek'
  if (inside(LATIN_EXT, cp)) return 'latinExt'
  return null
}

export interface TextRun {
  font: FontKey
  text: string
}

/** The text as runs of one font each; characters no font has become stand-ins ('?' at worst). */
export function textRuns(text: string, base: 'regular' | 'semibold' = 'regular'): TextRun[] {
  const runs: TextRun[] = []
  const push = (font: FontKey, s: string) => {
    const last = runs[runs.length - 1]
    if (last && last.font === font) last.text += s
    else runs.push({ font, text: s })
  }
  for (const ch of text.replace(/[\r\n\t]+/g, ' ')) {
    const font = fontFor(ch.codePointAt(0)!, base)
    if (font) { push(font, ch); continue }
    const stand = STAND_INS[ch] ?? ch.normalize('NFKC')
    for (const c of stand) push(fontFor(c.codePointAt(0)!, base) ?? base, fontFor(c.codePointAt(0)!, base) ? c : '?')
  }
  return runs
}
