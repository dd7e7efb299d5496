/// <reference lib="webworker" />
/** Computes design-space maps off the page's thread (see composables/designMap.ts). */
import '@/zod-jitless'
import type { DesignMapRequest } from '@/composables/designMap'
import { computeDesignMap } from '@/composables/designMapCompute'

self.onmessage = (event: MessageEvent<{ id: number; request: DesignMapRequest }>) => {
  const { id, request } = event.data
  try {
    self.postMessage({ id, map: computeDesignMap(request) })
  } catch (e) {
    self.postMessage({ id, error: (e as Error).message })
  }
}
