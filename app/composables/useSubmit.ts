import { formErrors, type FormErrors } from '~/utils/errors'

const none = (): FormErrors => ({ message: '', fields: {} })

/**
 * The state of a form that sends to the API: busy while it runs, and the errors it answered
 * (a message for the form, one per field). What was typed stays put; the caller clears it on success.
 */
export function useSubmit(action: () => Promise<unknown>) {
  const busy = ref(false)
  const errors = ref<FormErrors>(none())

  async function submit(): Promise<boolean> {
    busy.value = true
    errors.value = none()
    try {
      await action()
      return true
    }
    catch (err) {
      errors.value = formErrors(err)
      return false
    }
    finally {
      busy.value = false
    }
  }

  /** Show errors found before sending (checks the browser can make itself). */
  function fail(fields: Record<string, string>, message = 'Check the highlighted fields.') {
    errors.value = { message, fields }
  }

  return { busy, errors, submit, fail }
}
