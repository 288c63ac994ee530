// Sending a set log (or a problem found) and its photos through the outbox: at once with a signal,
// kept on the phone with none. The photos are shrunk first and go after the entry they belong to.
import { shrinkPhoto } from '~/utils/photo-shrink'

export interface SetLogSend {
  jobId: string
  /** Made when the form opened: the entry's id on the phone and its clientId on the server. */
  clientId: string
  body: Record<string, unknown>
  /** In words, for the list of what waits ("Set 1 on BP-J5"). */
  label: string
  photos: { id: string, file: File }[]
}

export function useSetLogSend() {
  const outbox = useOutboxStore()
  /** Resolves { queued } (true: kept on the phone); throws the server's refusal of the entry, for the form to show. */
  return async function sendSetLog(o: SetLogSend): Promise<{ queued: boolean }> {
    const link = `/jobs/${o.jobId}`
    const sent = await outbox.send({ id: o.clientId, kind: o.body.kind === 'problem' ? 'problem' : 'set-log', label: o.label, link, method: 'POST', url: `/api/jobs/${o.jobId}/logs`, body: o.body })
    for (const [i, p] of o.photos.entries()) {
      const blob = await shrinkPhoto(p.file)
      await outbox.enqueue({
        id: p.id,
        kind: 'photo',
        label: `Photo ${i + 1} of ${o.label}`,
        link,
        method: 'POST',
        url: '/api/photos/uploads',
        photo: { blob, name: p.file.name.replace(/\.\w+$/, '') + '.jpg', caption: '', target: {}, setLogOf: o.clientId },
      })
    }
    return { queued: sent.queued }
  }
}
