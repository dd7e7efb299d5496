import { computed, onMounted, ref, shallowRef } from 'vue'
import { ApiError, entriesApi, type EntrySummary, asApiError } from '@/api'
import { useReferenceStore } from '@/stores/reference'
import { emptyFilters, filterRows, shelfRows, tagsOf, type ShelfFilters } from './shelf'

/** Loads the shelf and keeps its filters; the view only binds. */
export function useShelf() {
  const reference = useReferenceStore()
  const entries = shallowRef<EntrySummary[]>([])
  const loading = ref(true)
  const error = shallowRef<ApiError | null>(null)
  const filters = ref<ShelfFilters>(emptyFilters())

  async function load() {
    loading.value = true
    error.value = null
    try {
      const [list] = await Promise.all([entriesApi.list(), reference.load()])
      entries.value = list
    } catch (e) {
      error.value = asApiError(e)
    } finally {
      loading.value = false
    }
  }

  const rows = computed(() => shelfRows(entries.value, reference.families))
  const visible = computed(() => filterRows(rows.value, filters.value))
  const tags = computed(() => tagsOf(entries.value))
  const filtering = computed(() => {
    const f = filters.value
    return !!(f.text.trim() || f.families.length || f.statuses.length || f.tags.length)
  })

  function clearFilters() {
    filters.value = emptyFilters()
  }

  onMounted(load)
  return { entries, rows, visible, tags, filters, filtering, loading, error, load, clearFilters }
}
