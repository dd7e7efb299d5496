import { ref } from 'vue'
import { ApiError, asApiError } from '@/api'
import { fetchFile } from '@/api/configure'
import { useSessionStore } from '@/stores/session'

/** Hands a blob to the browser as a download under the given name. */
function saveBlob(blob: Blob, fileName: string): void {
  const url = URL.createObjectURL(blob)
  const a = document.createElement('a')
  a.href = url
  a.download = fileName
  a.rel = 'noopener'
  document.body.appendChild(a)
  a.click()
  a.remove()
  // the download has started from the object URL; free it once the click is handled
  setTimeout(() => URL.revokeObjectURL(url), 30_000)
}

/**
 * Downloads a file from an authenticated route (a plain link cannot send the bearer token),
 * keeping the server's file name; one download per kind at a time.
 */
export function useFileDownload() {
  const session = useSessionStore()
  const busy = ref<string | null>(null)
  const error = ref<ApiError | null>(null)
  const notices = ref<string[]>([])

  async function download(kind: string, path: string, fallbackName: string): Promise<string | null> {
    if (busy.value) return null
    busy.value = kind
    error.value = null
    try {
      const file = await fetchFile(path, session.token, fallbackName)
      notices.value = file.notices
      saveBlob(file.blob, file.fileName)
      return file.fileName
    } catch (e) {
      error.value = asApiError(e)
      return null
    } finally {
      busy.value = null
    }
  }

  return { busy, error, notices, download }
}
