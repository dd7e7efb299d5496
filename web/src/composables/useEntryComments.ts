import { ref, type ShallowRef } from 'vue'
import { asApiError } from '@/api'
import { curationApi, type EntryDetail } from '@/api/curation'

/** Posting to an entry's comment thread; a new comment is appended to the entry held in `entry`. */
export function useEntryComments(entry: ShallowRef<EntryDetail | null>) {
  const posting = ref(false)
  const commentError = ref('')

  async function comment(text: string): Promise<boolean> {
    if (!entry.value) return false
    posting.value = true
    commentError.value = ''
    try {
      const created = await curationApi.comment(entry.value.id, text)
      entry.value = { ...entry.value, comments: [...entry.value.comments, created] }
      return true
    } catch (e) {
      commentError.value = asApiError(e).message
      return false
    } finally {
      posting.value = false
    }
  }

  return { posting, commentError, comment }
}
