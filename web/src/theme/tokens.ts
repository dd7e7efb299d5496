/**
 * Flexshelf's palette, defined once. Everything else reads these tokens: the naive-ui
 * theme overrides, the CSS variables on the page and the plot colours.
 *
 * `window` is the one accent and means only "inside the force window"; everything
 * interactive uses the neutral `secondary` slate.
 */
export type ThemeMode = 'light' | 'dark'

export interface Palette {
  /** Page background. */
  bg: string
  /** Cards, tables, popovers. */
  surface: string
  /** Recessed areas (plot background, code). */
  sunken: string
  /** Body text. */
  ink: string
  /** Secondary text: help, units, captions. */
  inkMuted: string
  /** Hairlines and borders. */
  line: string
  /** Neutral secondary for links, buttons, focus and the live curve. */
  secondary: string
  secondaryHover: string
  secondaryPressed: string
  /** Text on a `secondary` fill. */
  onSecondary: string
  /** The accent: inside the force window. */
  window: string
  /** The accent as a translucent band behind plots. */
  windowBand: string
  /** The stored curve drawn faintly behind the live one. */
  stored: string
  danger: string
  warning: string
}

export const palettes: Record<ThemeMode, Palette> = {
  light: {
    bg: '#F5F4EF',
    surface: '#FFFFFF',
    sunken: '#EEEDE7',
    ink: '#1D2428',
    inkMuted: '#535F67',
    line: '#D8D7CF',
    secondary: '#3C5566',
    secondaryHover: '#2F4553',
    secondaryPressed: '#243743',
    onSecondary: '#FFFFFF',
    window: '#0B6E5A',
    windowBand: 'rgba(11, 110, 90, 0.13)',
    stored: '#A2AAAF',
    danger: '#A3302B',
    warning: '#7E5300',
  },
  dark: {
    bg: '#13171A',
    surface: '#1B2024',
    sunken: '#101316',
    ink: '#E6E8E6',
    inkMuted: '#A3ADB2',
    line: '#313A40',
    secondary: '#9DB7C7',
    secondaryHover: '#B4C9D6',
    secondaryPressed: '#86A2B3',
    onSecondary: '#10171C',
    window: '#4CC7A7',
    windowBand: 'rgba(76, 199, 167, 0.16)',
    stored: '#5E686E',
    danger: '#F2877D',
    warning: '#E3B664',
  },
}

export const fontFamily = '"IBM Plex Sans", system-ui, -apple-system, "Segoe UI", sans-serif'
export const fontFamilyMono = '"IBM Plex Mono", ui-monospace, "SFMono-Regular", Menlo, monospace'

/** The palette as CSS custom properties (`--fs-bg`, `--fs-ink-muted`, …). */
export function cssVariables(p: Palette): Record<string, string> {
  const vars: Record<string, string> = {}
  for (const [key, value] of Object.entries(p)) {
    vars[`--fs-${key.replace(/[A-Z]/g, (c) => `-${c.toLowerCase()}`)}`] = value
  }
  return vars
}

function channel(c: number): number {
  const s = c / 255
  return s <= 0.03928 ? s / 12.92 : ((s + 0.055) / 1.055) ** 2.4
}

/** Relative luminance of an sRGB hex colour (WCAG 2.x definition). */
function relativeLuminance(hex: string): number {
  const m = /^#([0-9a-f]{6})$/i.exec(hex)
  if (!m) throw new Error(`colour must be #rrggbb, got "${hex}"`)
  const n = parseInt(m[1], 16)
  return 0.2126 * channel((n >> 16) & 255) + 0.7152 * channel((n >> 8) & 255) + 0.0722 * channel(n & 255)
}

/** WCAG 2.x contrast ratio between two opaque colours, from 1 to 21. */
export function contrastRatio(a: string, b: string): number {
  const la = relativeLuminance(a)
  const lb = relativeLuminance(b)
  return (Math.max(la, lb) + 0.05) / (Math.min(la, lb) + 0.05)
}
