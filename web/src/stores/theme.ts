import { defineStore } from 'pinia'
import { ref, watch } from 'vue'
import type { ThemeMode } from '@/theme/tokens'

const THEME_KEY = 'flexshelf.theme'

function initialMode(): ThemeMode {
  const saved = localStorage.getItem(THEME_KEY)
  if (saved === 'light' || saved === 'dark') return saved
  return window.matchMedia?.('(prefers-color-scheme: dark)').matches ? 'dark' : 'light'
}

/** Light or dark, remembered in the browser. */
export const useThemeStore = defineStore('theme', () => {
  const mode = ref<ThemeMode>(initialMode())
  watch(mode, (m) => {
    localStorage.setItem(THEME_KEY, m)
    document.documentElement.dataset.theme = m
  }, { immediate: true })

  function toggle() {
    mode.value = mode.value === 'dark' ? 'light' : 'dark'
  }
  return { mode, toggle }
})
