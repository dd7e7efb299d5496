import { describe, expect, it } from 'vitest'
import { mount } from '@vue/test-utils'
import { defineComponent, h, withDirectives } from 'vue'
import { NInputNumber } from 'naive-ui'
import { vStepperLabels } from '../stepperLabels'

describe('vStepperLabels', () => {
  it('names the − and + buttons of a naive-ui number input after the field', () => {
    const Field = defineComponent(() => () => withDirectives(h('div', [h(NInputNumber, { value: 3 })]), [[vStepperLabels, 'Span']]))
    const wrapper = mount(Field)
    const observed = wrapper.findAll('.n-input-number .n-button').map((b) => b.attributes('aria-label'))
    expect(observed).toEqual(['Decrease Span', 'Increase Span'])
    wrapper.unmount()
  })
})
