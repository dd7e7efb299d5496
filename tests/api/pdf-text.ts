/**
 * A small reader for the PDFs Flexshelf writes (pdfkit): pages, and the text shown on them.
 * Streams are inflated when deflated; text operators (Tj / TJ) are decoded through each
 * font's ToUnicode CMap, so embedded (subset) fonts read back as the text that was written.
 * Enough for tests; not a general PDF parser.
 */
import { inflateSync } from 'node:zlib'

interface PdfObject {
  dict: string
  stream: Buffer | null
}

function readObjects(pdf: Buffer): Map<number, PdfObject> {
  const text = pdf.toString('latin1')
  const objects = new Map<number, PdfObject>()
  const header = /(\d+) 0 obj\s*/g
  let match: RegExpExecArray | null
  while ((match = header.exec(text))) {
    const start = match.index + match[0].length
    const end = text.indexOf('endobj', start)
    const body = text.slice(start, end)
    const streamAt = body.indexOf('stream')
    let dict = body
    let stream: Buffer | null = null
    if (streamAt >= 0 && /\/Length (\d+)/.test(body.slice(0, streamAt))) {
      dict = body.slice(0, streamAt)
      const length = Number(/\/Length (\d+)/.exec(dict)![1])
      let dataStart = start + streamAt + 'stream'.length
      if (text[dataStart] === '\r') dataStart++
      if (text[dataStart] === '\n') dataStart++
      const raw = pdf.subarray(dataStart, dataStart + length)
      stream = /\/Filter\s*\/FlateDecode/.test(dict) ? inflateSync(raw) : Buffer.from(raw)
    }
    objects.set(Number(match[1]), { dict, stream })
    header.lastIndex = end
  }
  return objects
}

/** glyph code (hex) → text, from a ToUnicode CMap's bfchar and bfrange sections. */
function readCMap(cmap: string): Map<string, string> {
  const map = new Map<string, string>()
  const hexToText = (spaced: string) => {
    // a ligature maps to several characters, written with spaces between them: <0066 0069>
    const hex = spaced.replace(/\s+/g, '')
    let s = ''
    for (let i = 0; i < hex.length; i += 4) s += String.fromCharCode(parseInt(hex.slice(i, i + 4), 16))
    return s
  }
  for (const block of cmap.matchAll(/beginbfchar([\s\S]*?)endbfchar/g)) {
    for (const [, code, uni] of block[1].matchAll(/<([0-9a-fA-F]+)>\s*<([0-9a-fA-F\s]+)>/g)) map.set(code.toLowerCase(), hexToText(uni))
  }
  for (const block of cmap.matchAll(/beginbfrange([\s\S]*?)endbfrange/g)) {
    for (const [, lo, hi, rest] of block[1].matchAll(/<([0-9a-fA-F]+)>\s*<([0-9a-fA-F]+)>\s*(\[[^\]]*\]|<[0-9a-fA-F\s]+>)/g)) {
      const from = parseInt(lo, 16)
      const to = parseInt(hi, 16)
      const width = lo.length
      if (rest.startsWith('[')) {
        const values = [...rest.matchAll(/<([0-9a-fA-F\s]+)>/g)].map((m) => hexToText(m[1]))
        for (let c = from; c <= to; c++) map.set(c.toString(16).padStart(width, '0'), values[c - from] ?? '')
      } else {
        const base = parseInt(rest.slice(1, -1), 16)
        for (let c = from; c <= to; c++) map.set(c.toString(16).padStart(width, '0'), String.fromCharCode(base + c - from))
      }
    }
  }
  return map
}

export interface PdfReading {
  pageCount: number
  /** One string per text-showing operator, page by page. */
  pages: string[][]
  /** Every text operator joined by one space, whitespace collapsed: wrapped lines read as one paragraph. */
  text: string
}

export function readPdf(pdf: Buffer): PdfReading {
  const objects = readObjects(pdf)
  const ref = (dict: string, key: string) => {
    const m = new RegExp(`/${key} (\\d+) 0 R`).exec(dict)
    return m ? Number(m[1]) : null
  }
  const pageIds = [...objects.entries()].filter(([, o]) => /\/Type \/Page\b/.test(o.dict)).map(([id]) => id)
  const pages: string[][] = []
  for (const pageId of pageIds) {
    const page = objects.get(pageId)!
    const fonts = new Map<string, Map<string, string>>()
    const resources = ref(page.dict, 'Resources')
    const resourceDict = resources !== null ? objects.get(resources)!.dict : page.dict
    const fontBlock = /\/Font\s*<<([\s\S]*?)>>/.exec(resourceDict)?.[1] ?? ''
    for (const [, name, id] of fontBlock.matchAll(/\/(\w+) (\d+) 0 R/g)) {
      const toUnicode = ref(objects.get(Number(id))!.dict, 'ToUnicode')
      fonts.set(name, toUnicode !== null ? readCMap(objects.get(toUnicode)!.stream!.toString('latin1')) : new Map())
    }
    const contents = ref(page.dict, 'Contents')
    const ops = contents !== null ? objects.get(contents)!.stream!.toString('latin1') : ''
    const shown: string[] = []
    let font = new Map<string, string>()
    for (const m of ops.matchAll(/\/(\w+) [\d.]+ Tf|(\[(?:[^\]]*)\]) TJ|(<[0-9a-fA-F]*>) Tj/g)) {
      if (m[1]) { font = fonts.get(m[1]) ?? new Map(); continue }
      const strings = [...(m[2] ?? m[3]).matchAll(/<([0-9a-fA-F]*)>/g)].map((s) => s[1].toLowerCase())
      let out = ''
      for (const hex of strings) {
        const size = font.size ? [...font.keys()][0].length : 2
        for (let i = 0; i < hex.length; i += size) {
          const code = hex.slice(i, i + size)
          out += font.get(code) ?? String.fromCharCode(parseInt(code, 16))
        }
      }
      shown.push(out)
    }
    pages.push(shown)
  }
  return { pageCount: pageIds.length, pages, text: pages.map((p) => p.join(' ')).join(' ').replace(/\s+/g, ' ') }
}
