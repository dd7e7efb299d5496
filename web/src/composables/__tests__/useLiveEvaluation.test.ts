import { afterEach, beforeEach, describe, expect, it, vi } from 'vitest'
import { defineComponent, h, nextTick, ref } from 'vue'
import { mount } from '@vue/test-utils'
import { ApiError } from '@/api'
import type { Evaluation } from '@/api/types'
import { paramFields, type ParamFormModel } from '../paramForm'
import { useLiveEvaluation } from '../useLiveEvaluation'

const fields = ref(paramFields([{ key: 'span', label: 'Span', unit: 'mm', default: 40, min: 10, max: 120, step: 1, help: '' }]))

function evaluation(span: number): Evaluation {
  return { family: 'f', method: 'm', params: { span }, material: { id: 'petg', name: 'PETG', modulus: 2000, strainLimit: 0.02, poissonRatio: 0.38 }, curve: { displacement: [0, 1], force: [0, span], axes: { displacement: { label: 'Displacement', unit: 'mm' }, force: { label: 'Force', unit: 'N' } } }, metrics: {}, warnings: [], source: '' }
}

function setup(evaluate: (id: string, body: { params: Record<string, number | string> }, signal?: AbortSignal) => Promise<Evaluation>) {
  const form = ref<ParamFormModel | null>(null)
  let live!: ReturnType<typeof useLiveEvaluation>
  const wrapper = mount(defineComponent({
    setup() {
      live = useLiveEvaluation(ref('f'), fields, form, { debounceMs: 200, evaluate: evaluate as never })
      return () => h('div')
    },
  }))
  return { form, live: () => live, wrapper }
}

beforeEach(() => { vi.useFakeTimers() })
afterEach(() => { vi.useRealTimers() })

describe('useLiveEvaluation', () => {
  it('waits for a pause in editing and sends one request for a burst of edits', async () => {
    const evaluate = vi.fn(async (_id: string, body: { params: Record<string, number | string> }) => evaluation(body.params.span as number))
    const { form, live } = setup(evaluate)
    form.value = { values: { span: 40 }, material: 'petg' }
    await nextTick()
    form.value.values.span = 41
    await nextTick()
    form.value.values.span = 42
    await nextTick()
    expect(evaluate).not.toHaveBeenCalled()
    await vi.advanceTimersByTimeAsync(250)
    expect(evaluate).toHaveBeenCalledTimes(1)
    expect(evaluate.mock.calls[0][1]).toEqual({ params: { span: 42, material: 'petg' }, method: undefined })
    expect(live().result.value?.params.span).toBe(42)
    expect(live().pending.value).toBe(false)
  })

  it('aborts the request in flight and ignores its late answer', async () => {
    const resolvers: Array<(e: Evaluation) => void> = []
    const signals: AbortSignal[] = []
    const evaluate = vi.fn((_id: string, _body: unknown, signal?: AbortSignal) => {
      signals.push(signal!)
      return new Promise<Evaluation>((resolve) => resolvers.push(resolve))
    })
    const { form, live } = setup(evaluate)
    form.value = { values: { span: 40 }, material: null }
    await vi.advanceTimersByTimeAsync(250)
    form.value.values.span = 50
    await vi.advanceTimersByTimeAsync(250)
    expect(evaluate).toHaveBeenCalledTimes(2)
    expect(signals[0].aborted).toBe(true)
    resolvers[1](evaluation(50))
    await vi.advanceTimersByTimeAsync(0)
    resolvers[0](evaluation(40)) // the stale answer arrives last (a server that ignores aborts)
    await vi.advanceTimersByTimeAsync(0)
    expect(live().result.value?.params.span).toBe(50)
  })

  it('shows server field issues and keeps the last good curve', async () => {
    let fail = false
    const evaluate = vi.fn(async (_id: string, body: { params: Record<string, number | string> }) => {
      if (fail) throw new ApiError(400, 'validation_failed', 'invalid', { issues: [{ field: 'span', message: 'Span must exceed twice the apex height' }] })
      return evaluation(body.params.span as number)
    })
    const { form, live } = setup(evaluate)
    form.value = { values: { span: 40 }, material: null }
    await vi.advanceTimersByTimeAsync(250)
    fail = true
    form.value.values.span = 12
    await vi.advanceTimersByTimeAsync(250)
    expect(live().issues.value).toEqual([{ field: 'span', message: 'Span must exceed twice the apex height' }])
    expect(live().error.value).toBeNull()
    expect(live().result.value?.params.span).toBe(40)
  })

  it('does not call the server while a field is out of range', async () => {
    const evaluate = vi.fn(async () => evaluation(1))
    const { form, live } = setup(evaluate)
    form.value = { values: { span: 5 }, material: null }
    await vi.advanceTimersByTimeAsync(250)
    expect(evaluate).not.toHaveBeenCalled()
    expect(live().issues.value[0]).toMatchObject({ field: 'span' })
  })

  it('surfaces a solver failure as an error', async () => {
    const evaluate = vi.fn(async () => { throw new ApiError(422, 'solver_failed', 'The path could not be followed past 2.1 mm') })
    const { form, live } = setup(evaluate)
    form.value = { values: { span: 40 }, material: null }
    await vi.advanceTimersByTimeAsync(250)
    expect(live().error.value?.code).toBe('solver_failed')
  })

  it('cancels its timer when the page goes away', async () => {
    const evaluate = vi.fn(async () => evaluation(1))
    const { form, wrapper } = setup(evaluate)
    form.value = { values: { span: 40 }, material: null }
    await nextTick()
    wrapper.unmount()
    await vi.advanceTimersByTimeAsync(500)
    expect(evaluate).not.toHaveBeenCalled()
  })
})
