import { defineStore } from 'pinia'
import { ref } from 'vue'
import { familiesApi, materialsApi, type Family, type Material } from '@/api'

/** Families and materials change rarely; the shelf and the entry page share one copy. */
export const useReferenceStore = defineStore('reference', () => {
  const families = ref<Family[]>([])
  const materials = ref<Material[]>([])
  let loading: Promise<void> | null = null

  function load(): Promise<void> {
    loading ??= Promise.all([familiesApi.list(), materialsApi.list()])
      .then(([f, m]) => {
        families.value = f
        materials.value = m
      })
      .catch((error) => {
        loading = null // let the next view try again
        throw error
      })
    return loading
  }

  function family(id: string): Family | undefined {
    return families.value.find((f) => f.id === id)
  }

  function reset() {
    families.value = []
    materials.value = []
    loading = null
  }

  return { families, materials, load, family, reset }
})
