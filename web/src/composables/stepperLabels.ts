/**
 * naive-ui's number input draws its − and + buttons without an accessible name (and out of
 * the tab order: keyboard users step with the arrow keys). This directive names them after
 * the field ("Decrease Span", "Increase Span") so screen readers announce what they do.
 * Usage: <div v-stepper-labels="field.label"><NInputNumber … /></div>
 */
import type { Directive } from 'vue'

function labelSteppers(root: HTMLElement, label: string): void {
  for (const input of root.querySelectorAll('.n-input-number')) {
    const buttons = input.querySelectorAll<HTMLElement>('.n-input__suffix .n-button, .n-input__prefix .n-button')
    // the minus button comes first, then the plus (buttonPlacement 'right' or 'both')
    if (buttons.length !== 2) continue
    buttons[0].setAttribute('aria-label', `Decrease ${label}`)
    buttons[1].setAttribute('aria-label', `Increase ${label}`)
  }
}

export const vStepperLabels: Directive<HTMLElement, string> = {
  mounted: (el, binding) => labelSteppers(el, binding.value),
  updated: (el, binding) => labelSteppers(el, binding.value),
}
