/** What a confirmation asks: a question as its title, what follows in words, and the two answers. */
export interface ConfirmAsk {
  title: string
  message?: string
  /** The button that goes ahead, in words of what it does ("Remove Ann"), never just "OK". */
  yes: string
  no?: string
  /** Red for what cannot be undone (a removal, a deletion). */
  danger?: boolean
}

interface Pending extends ConfirmAsk {
  resolve: (yes: boolean) => void
}

// One question at a time for the whole app, answered by ShellConfirm (mounted once in app.vue).
// Asked only from a person's click, so it lives in the browser; a page rendered on the server
// never asks one.
const pending = shallowRef<Pending | null>(null)

/**
 * Ask the person before doing something that cannot be taken back. Resolves true when they
 * pick the `yes` button, false on the other one, Escape or a tap outside.
 *
 *   const ask = useConfirm()
 *   if (!await ask({ title: 'Delete this draft?', yes: 'Delete the draft', danger: true })) return
 */
export function useConfirm() {
  return (ask: ConfirmAsk) => new Promise<boolean>((resolve) => {
    pending.value?.resolve(false)
    pending.value = { ...ask, resolve }
  })
}

/** For ShellConfirm only: the question showing, and how to answer it. */
export function useConfirmQuestion() {
  const answer = (yes: boolean) => {
    const asked = pending.value
    pending.value = null
    asked?.resolve(yes)
  }
  return { question: readonly(pending), answer }
}
