import { computed, ref, type Ref } from 'vue'
import { useRouter } from 'vue-router'
import { useMessage } from 'naive-ui'
import { ApiError, type Entry } from '@/api'
import { configurationsApi, type Configuration, type SavedConfiguration } from '@/api/configure'

/**
 * Saving what is on the configure screen under a name (a shared one is copied to the viewer's
 * own list); the screen then opens the saved configuration.
 */
export function useSaveConfiguration(state: {
  entry: Ref<Entry | null>
  configuration: Ref<Configuration | null>
  saved: Ref<SavedConfiguration | null>
  readOnly: Ref<boolean>
}) {
  const router = useRouter()
  const message = useMessage()
  const open = ref(false)
  const saving = ref(false)
  const error = ref('')

  const suggestedName = computed(() => {
    const saved = state.saved.value
    if (saved) return state.readOnly.value ? `Copy of ${saved.name}` : saved.name
    return `${state.entry.value?.name ?? 'Configuration'}, ${new Date().toISOString().slice(0, 10)}`
  })

  async function save(name: string) {
    const config = state.configuration.value
    const entry = state.entry.value
    if (!config || !entry) return
    saving.value = true
    error.value = ''
    try {
      const created = await configurationsApi.create({ name, entryId: entry.id, ...config })
      open.value = false
      message.success(`Saved as “${created.name}”`)
      await router.replace({ name: 'configure', params: { id: String(entry.id) }, query: { configuration: String(created.id) } })
    } catch (e) {
      error.value = e instanceof ApiError ? (e.fieldMessage('name') || e.message) : String(e)
    } finally {
      saving.value = false
    }
  }

  return { open, saving, error, suggestedName, save }
}
