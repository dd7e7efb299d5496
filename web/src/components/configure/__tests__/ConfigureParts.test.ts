import { describe, expect, it } from 'vitest'
import { mount } from '@vue/test-utils'
import ConfigureWindowInputs from '../ConfigureWindowInputs.vue'
import ConfigurePrintability from '../ConfigurePrintability.vue'
import ConfigureVerdict from '../ConfigureVerdict.vue'
import { emptyWindowForm } from '@/composables/configureWindow'
import { checkPrintability } from '@catalog/printability/check'
import { bistableBeam } from '@catalog/families/bistable-beam'
import { judgeWithBand } from '@catalog/window/judge'

describe('ConfigureWindowInputs', () => {
  it('labels each bound of a snap hook window with its unit and shows a server issue under it', () => {
    const wrapper = mount(ConfigureWindowInputs, {
      props: { modelValue: emptyWindowForm('latch'), kind: 'latch', errors: { 'matingForce.max': 'matingForce.max must not be negative' } },
    })
    for (const id of ['window-matingForce-max', 'window-separationForce-min']) {
      expect(wrapper.find(`label[for="${id}"]`).exists(), id).toBe(true)
      expect(wrapper.find(`#${id}`).exists(), id).toBe(true)
    }
    expect(wrapper.find('#window-matingForce-max').attributes('aria-label')).toBe('Mating force at most (N)')
    expect(wrapper.find('[role="alert"]').text()).toBe('matingForce.max must not be negative')
  })
})

describe('ConfigurePrintability', () => {
  const report = { ...checkPrintability(bistableBeam, { span: 60, apexHeight: 2.1, thickness: 0.7, depth: 6, postLength: 0 }, { nozzle: 0.4, layer: 0.2 }), basis: 'common practice' }

  it('offers the printable thickness as one click and sends the fix', async () => {
    const wrapper = mount(ConfigurePrintability, { props: { report, labels: { thickness: 'Beam thickness' } } })
    const button = wrapper.find('button')
    expect(button.text()).toBe('Set beam thickness to 0.8 mm')
    await button.trigger('click')
    expect(wrapper.emitted('fix')).toEqual([[{ key: 'thickness', from: 0.7, to: 0.8 }]])
    expect(wrapper.text()).toContain('common practice')
    expect(wrapper.text()).toContain('100 % infill')
  })

  it('offers no fix when read only', () => {
    const wrapper = mount(ConfigurePrintability, { props: { report, labels: {}, readOnly: true } })
    expect(wrapper.find('button').exists()).toBe(false)
  })
})

describe('ConfigureVerdict', () => {
  it('shows both verdicts and the margins per bound', () => {
    const verdict = judgeWithBand(
      { kind: 'bistable', peakForce: { min: 3, max: 5 } },
      { peakForce: 3.65, valleyForce: -1.17, secondStablePosition: 3.82, bistable: true, safetyFactor: 1.64 },
      { peakForce: [2.8, 4.57], valleyForce: [-1.23, -0.98], secondStablePosition: [3.74, 3.88], safetyFactor: [1.59, 1.71] },
    )
    const wrapper = mount(ConfigureVerdict, { props: { verdict, strain: { nominal: verdict.nominal.strain, band: verdict.band.strain }, toleranceText: '±0.05 mm walls, ±10 % modulus' } })
    expect(wrapper.find('[data-testid="verdict-nominal"] .word').text()).toBe('Inside the window')
    expect(wrapper.find('[data-testid="verdict-band"] .word').text()).toBe('Outside')
    const rows = wrapper.findAll('tbody tr').map((r) => r.text())
    expect(rows[0]).toMatch(/Peak force at least 3 N\s*3.65 N\s*\+32 %\s*2.8 N\s*−10 %/)
    expect(wrapper.text()).toContain('1.64 ×')
  })
})
