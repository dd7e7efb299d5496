/** Confirmation dialogs of the review actions; those that need words keep the dialog open until they are given. */
import { h, ref } from 'vue'
import { NInput, type useDialog } from 'naive-ui'

type Dialog = ReturnType<typeof useDialog>

export interface ConfirmOptions {
  title: string
  content: string
  positiveText: string
  /** Danger-styled confirm button for steps that cannot be undone from here. */
  danger?: boolean
  action: () => Promise<boolean>
}

export function confirmAction(dialog: Dialog, o: ConfirmOptions): void {
  dialog.warning({
    title: o.title,
    content: o.content,
    positiveText: o.positiveText,
    negativeText: 'Cancel',
    positiveButtonProps: { type: o.danger ? 'error' : 'primary' },
    // keeps the dialog open (with its loading button) until the server answers
    onPositiveClick: () => o.action(),
  })
}

export interface TextConfirmOptions extends Omit<ConfirmOptions, 'action'> {
  label: string
  /** Said when the text is left empty; omit to make the text optional. */
  required?: string
  action: (text: string) => Promise<boolean>
}

/** A confirmation with a text box (a reason, a comment); answers via `action`, false keeps the dialog open. */
export function confirmWithText(dialog: Dialog, o: TextConfirmOptions): void {
  const text = ref('')
  const problem = ref('')
  dialog.warning({
    title: o.title,
    style: { width: '520px' },
    content: () => h('div', { class: 'review-dialog' }, [
      h('p', { style: 'margin: 0 0 12px' }, o.content),
      h('label', { for: 'review-dialog-text', style: 'display:block; font-size: 0.85rem; margin-bottom: 6px; font-weight: 500' }, o.label),
      h(NInput, {
        value: text.value,
        type: 'textarea',
        autosize: { minRows: 3, maxRows: 10 },
        maxlength: 5000,
        placeholder: '',
        status: problem.value ? 'error' : undefined,
        inputProps: { id: 'review-dialog-text' },
        'onUpdate:value': (v: string) => { text.value = v; if (v.trim()) problem.value = '' },
      }),
      problem.value ? h('p', { role: 'alert', style: 'margin: 6px 0 0; color: var(--fs-danger); font-size: 0.85rem' }, problem.value) : null,
    ]),
    positiveText: o.positiveText,
    negativeText: 'Cancel',
    positiveButtonProps: { type: o.danger ? 'error' : 'primary' },
    onPositiveClick: async () => {
      const t = text.value.trim()
      if (o.required && !t) {
        problem.value = o.required
        return false
      }
      return o.action(t)
    },
  })
}
