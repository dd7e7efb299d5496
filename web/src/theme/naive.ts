import { darkTheme, type GlobalTheme, type GlobalThemeOverrides } from 'naive-ui'
import { fontFamily, fontFamilyMono, palettes, type ThemeMode } from './tokens'

/** naive-ui theme overrides built from the palette, so components and page share one source. */
export function naiveOverrides(mode: ThemeMode): GlobalThemeOverrides {
  const p = palettes[mode]
  return {
    common: {
      fontFamily,
      fontFamilyMono,
      fontSize: '15px',
      fontSizeMedium: '15px',
      borderRadius: '6px',
      primaryColor: p.secondary,
      primaryColorHover: p.secondaryHover,
      primaryColorPressed: p.secondaryPressed,
      primaryColorSuppl: p.secondaryHover,
      // success stays neutral: green-ish tones belong to the force window alone
      successColor: p.secondary,
      successColorHover: p.secondaryHover,
      successColorPressed: p.secondaryPressed,
      successColorSuppl: p.secondaryHover,
      infoColor: p.secondary,
      infoColorHover: p.secondaryHover,
      infoColorPressed: p.secondaryPressed,
      infoColorSuppl: p.secondaryHover,
      errorColor: p.danger,
      warningColor: p.warning,
      bodyColor: p.bg,
      cardColor: p.surface,
      modalColor: p.surface,
      popoverColor: p.surface,
      tableColor: p.surface,
      tableHeaderColor: p.surface,
      textColorBase: p.ink,
      textColor1: p.ink,
      textColor2: p.ink,
      textColor3: p.inkMuted,
      placeholderColor: p.inkMuted,
      borderColor: p.line,
      dividerColor: p.line,
    },
    Button: { textColorPrimary: p.onSecondary, textColorHoverPrimary: p.onSecondary, textColorPressedPrimary: p.onSecondary, textColorFocusPrimary: p.onSecondary },
    DataTable: { thColor: p.surface, tdColor: p.surface, tdColorHover: p.sunken, thTextColor: p.inkMuted, thFontWeight: '500' },
    Card: { borderRadius: '10px' },
    // alerts tinted, not filled: warnings are read, not shouted
    Alert: {
      colorWarning: mode === 'dark' ? 'rgba(227, 182, 100, 0.08)' : 'rgba(126, 83, 0, 0.05)',
      borderWarning: `1px solid ${p.warning}66`,
      titleTextColorWarning: p.ink,
      iconColorWarning: p.warning,
      colorError: mode === 'dark' ? 'rgba(242, 135, 125, 0.08)' : 'rgba(163, 48, 43, 0.05)',
      borderError: `1px solid ${p.danger}66`,
      titleTextColorError: p.ink,
      iconColorError: p.danger,
    },
  }
}

export function naiveTheme(mode: ThemeMode): GlobalTheme | null {
  return mode === 'dark' ? darkTheme : null
}
