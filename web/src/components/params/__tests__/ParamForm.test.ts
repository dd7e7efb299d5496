import { describe, expect, it } from 'vitest'
import { mount } from '@vue/test-utils'
import ParamForm from '../ParamForm.vue'
import { paramFields } from '@/composables/paramForm'
import type { Material, ParamSpec } from '@/api/types'

const specs: ParamSpec[] = [
  { key: 'span', label: 'Span', unit: 'mm', default: 40, min: 10, max: 120, step: 0.5, help: 'Distance between the clamps' },
  { key: 'apexHeight', label: 'Apex height', unit: 'mm', default: 3, min: 0.5, max: 10, step: 0.05, help: 'Rise at mid-span' },
]
const petg: Material = { id: 'petg', name: 'PETG (FDM)', process: 'FDM', modulus: 2000, poissonRatio: 0.38, poissonRatioSource: '', strainLimit: 0.02, density: 1.27, notes: '', source: '' }

function render(errors: Record<string, string> = {}, extra: { wideBeam?: 'auto' | 'off' } = {}) {
  return mount(ParamForm, {
    props: {
      modelValue: { values: { span: 40, apexHeight: 3 }, material: 'petg', ...extra },
      fields: paramFields(specs, { span: [32, 48] }),
      materials: [petg],
      methods: [{ id: 'nonlinear-fe', label: 'Nonlinear beam finite elements', source: '' }, { id: 'closed-form', label: 'Closed form', source: '' }],
      errors,
    },
  })
}

describe('ParamForm', () => {
  it('offers the wide-beam choice only for a family that bends beams, with the plate factor for the material', () => {
    expect(render().find('#param-wideBeam').exists()).toBe(false)
    const wrapper = render({}, { wideBeam: 'auto' })
    expect(wrapper.find('label[for="param-wideBeam"]').text()).toBe('Wide-beam correction')
    // 1/(1 − ν²) for PETG's ν 0.38 (Timoshenko & Woinowsky-Krieger, cylindrical bending): 1.169
    expect(wrapper.find('#param-wideBeam-help').text()).toContain('1.17 × for ν 0.38')
    expect(render({}, { wideBeam: 'off' }).find('#param-wideBeam-help').text()).toContain('Plain beam theory')
  })

  it('labels every input, shows its unit and the range narrowed for the entry', () => {
    const wrapper = render()
    for (const key of ['span', 'apexHeight', 'material', 'method']) {
      const label = wrapper.find(`label[for="param-${key}"]`)
      expect(label.exists(), `label for ${key}`).toBe(true)
      expect(wrapper.find(`#param-${key}`).exists(), `input for ${key}`).toBe(true)
    }
    expect(wrapper.find('label[for="param-span"]').text()).toContain('Span')
    const help = wrapper.find('#param-span-help').text()
    expect(help).toContain('32–48 mm for this entry')
    expect(help).toContain('Distance between the clamps')
    expect(wrapper.find('#param-apexHeight-help').text()).toContain('0.5–10 mm')
    expect(wrapper.find('#param-apexHeight-help').text()).not.toContain('for this entry')
    expect(wrapper.find('#param-material-help').text()).toContain('E 2,000 MPa · strain limit 2 %')
  })

  it('shows a server message under its field', () => {
    const wrapper = render({ apexHeight: 'Apex height must be at least 3 times the thickness' })
    expect(wrapper.text()).toContain('Apex height must be at least 3 times the thickness')
  })
})
