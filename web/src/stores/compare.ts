/** Up to four candidates chosen for the Compare screen (search results or saved configurations), kept for the session. */
import { defineStore } from 'pinia'
import { computed, ref, watch } from 'vue'

const MAX_COMPARED = 4

export type CompareChoice =
  | { kind: 'result'; entryId: number; params: Record<string, number | string>; label: string }
  | { kind: 'saved'; configurationId: number; label: string }

const KEY = 'flexshelf.compare'
const keyOf = (c: CompareChoice) => (c.kind === 'saved' ? `saved:${c.configurationId}` : `result:${c.entryId}:${JSON.stringify(c.params)}`)

export const useCompareStore = defineStore('compare', () => {
  let initial: CompareChoice[] = []
  try { initial = JSON.parse(sessionStorage.getItem(KEY) ?? '[]') } catch { initial = [] }
  const chosen = ref<CompareChoice[]>(Array.isArray(initial) ? initial.slice(0, MAX_COMPARED) : [])
  watch(chosen, (v) => sessionStorage.setItem(KEY, JSON.stringify(v)), { deep: true })
  const keys = computed(() => new Set(chosen.value.map(keyOf)))
  const has = (c: CompareChoice) => keys.value.has(keyOf(c))
  const full = computed(() => chosen.value.length >= MAX_COMPARED)
  function toggle(c: CompareChoice) {
    if (has(c)) chosen.value = chosen.value.filter((x) => keyOf(x) !== keyOf(c))
    else if (!full.value) chosen.value = [...chosen.value, c]
  }
  const remove = (i: number) => { chosen.value = chosen.value.filter((_, k) => k !== i) }
  const clear = () => { chosen.value = [] }
  /** The API's `items` list. */
  const items = computed(() => chosen.value.map((c) => (c.kind === 'saved' ? { configurationId: c.configurationId } : { entryId: c.entryId, params: c.params })))
  return { chosen, has, full, toggle, remove, clear, items }
})
