/** The pieces of an API error a form shows: a message for the whole form, and one per field. */
export interface FormErrors { message: string, fields: Record<string, string> }

export function formErrors(err: unknown, fallback = 'Something went wrong. Check your connection and try again.'): FormErrors {
  const e = err as { data?: { statusMessage?: string, data?: { fields?: Record<string, string>, message?: string } }, statusCode?: number }
  const data = e?.data?.data
  const fields = data?.fields ?? {}
  let message = data?.message ?? ''
  if (!message && Object.keys(fields).length) message = 'Check the highlighted fields.'
  if (!message) message = e?.statusCode && e.statusCode < 500 ? (e.data?.statusMessage ?? fallback) : fallback
  return { message, fields }
}
