// The props of a small form in a dialog, shared by ShellDialog (the lazy wrapper a page uses) and
// ShellDialogPanel (reka-ui's dialog, loaded the first time one opens), which takes them all on.

export interface FormDialogProps {
  title: string
  description?: string
  /** The button that sends, in words of what it does. */
  submitLabel: string
  busy?: boolean
  /** The error for the whole form, from useSubmit's errors.message. */
  message?: string
  danger?: boolean
}

export const FORM_DIALOG_DEFAULTS = { description: '', busy: false, message: '', danger: false } as const
