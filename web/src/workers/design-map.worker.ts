/// <reference lib="webworker" />
/** Computes design-space maps off the page's thread (see composables/designMap.ts). */
import '@/zod-jitless'
import type { DesignMapRequest } from '@/composables/designMap'
import { computeDesignMap } from '@/composables/designMapCompute'
import { loadBistableTable } from '@catalog/families/bistable-beam/table-store'

self.onmessage = async (event: MessageEvent<{ id: number; request: DesignMapRequest }>) => {
  const { id, request } = event.data
  try {
    // the bistable table is its own chunk, fetched the first time a bistable map is asked for
    if (request.familyId === 'bistable-beam') await loadBistableTable()
    self.postMessage({ id, map: computeDesignMap(request) })
  } catch (e) {
    self.postMessage({ id, error: (e as Error).message })
  }
}
