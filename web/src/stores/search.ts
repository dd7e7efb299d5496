import { defineStore } from 'pinia'
import { useSearch } from '@/composables/useSearch'

/** The last search and its answer, kept while the engineer opens a result and comes back. */
export const useSearchStore = defineStore('search', () => useSearch())
