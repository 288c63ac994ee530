// Releasing many requests at the same moment: every call waits behind one gate, the gate opens,
// and all of them are in flight together (Promise.all). Used by the tests of rules that must
// hold whatever runs at once, which then read the database to see what was really written.

/** Start `n` calls of `fn` behind one gate, open it, and wait for them all. */
export async function together<R>(n: number, fn: (i: number) => Promise<R>): Promise<R[]> {
  let open!: () => void
  const gate = new Promise<void>((resolve) => {
    open = resolve
  })
  const calls = Array.from({ length: n }, (_, i) => gate.then(() => fn(i)))
  open()
  return Promise.all(calls)
}

/** How many answers had each status, as `{ 200: 1, 409: 3 }`. */
export function statuses(answers: { status: number }[]): Record<number, number> {
  const out: Record<number, number> = {}
  for (const a of answers) out[a.status] = (out[a.status] ?? 0) + 1
  return out
}
