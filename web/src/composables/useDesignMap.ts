import { onBeforeUnmount, shallowRef, watch, type Ref } from 'vue'
import type { DesignMap, DesignMapRequest } from './designMap'

/** performance.mark names: the browser test reads the measure to print how long a map took. */
const MAP_MARK = 'design-map-request'
const MAP_MEASURE = 'design-map'

/**
 * Design maps computed on a web worker, so the page stays responsive. A newer request
 * replaces an older one (its late answer is dropped).
 */
export function useDesignMap(request: Ref<DesignMapRequest | null>) {
  const map = shallowRef<DesignMap | null>(null)
  const error = shallowRef<string | null>(null)
  const pending = shallowRef(false)
  let worker: Worker | null = null
  let latest = 0

  function ensureWorker(): Worker {
    if (worker) return worker
    worker = new Worker(new URL('../workers/design-map.worker.ts', import.meta.url), { type: 'module' })
    worker.onmessage = (e: MessageEvent<{ id: number; map?: DesignMap; error?: string }>) => {
      if (e.data.id !== latest) return
      pending.value = false
      if (e.data.map) { map.value = e.data.map; error.value = null }
      else error.value = e.data.error ?? 'the map could not be computed'
    }
    worker.onerror = (e) => { pending.value = false; error.value = e.message || 'the map worker failed' }
    return worker
  }

  watch(request, (req) => {
    if (!req) return
    latest++
    pending.value = true
    performance.mark(MAP_MARK)
    // plain data only: a reactive proxy cannot be cloned into the worker
    ensureWorker().postMessage({ id: latest, request: JSON.parse(JSON.stringify(req)) })
  }, { immediate: true })

  onBeforeUnmount(() => worker?.terminate())

  /** Called once the chart has drawn the map: records the time from request to picture. */
  function drawn(): number | null {
    try {
      const m = performance.measure(MAP_MEASURE, MAP_MARK)
      return m.duration
    } catch {
      return null
    }
  }

  return { map, error, pending, drawn }
}
