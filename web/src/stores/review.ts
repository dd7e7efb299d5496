import { defineStore } from 'pinia'
import { ref } from 'vue'
import { curationApi } from '@/api/curation'

/** How much waits for a librarian; the nav bar's badge and the review queue share it. */
export const useReviewStore = defineStore('review', () => {
  const count = ref<number | null>(null)

  async function refresh(): Promise<void> {
    try {
      const queue = await curationApi.reviewQueue()
      // the totals: the queue answers one page at a time
      count.value = queue.page ? queue.page.totalEntries + queue.page.totalReports : queue.entries.length + queue.reports.length
    } catch {
      // the badge is a hint; the queue page reports its own errors
    }
  }

  function set(n: number) {
    count.value = n
  }

  function reset() {
    count.value = null
  }

  return { count, refresh, set, reset }
})
