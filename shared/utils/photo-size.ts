/** The longest edge of a photo as kept (server/utils/images.ts); a phone shrinks what it queues to this. */
export const PHOTO_FULL_EDGE_PX = 2560

/** The size a photo is drawn at before it is queued on the phone: the longest edge at most `edge`, never enlarged, the shape kept. */
export function shrunkSize(width: number, height: number, edge = PHOTO_FULL_EDGE_PX): { width: number, height: number } {
  const scale = Math.min(1, edge / Math.max(width, height))
  return { width: Math.max(1, Math.round(width * scale)), height: Math.max(1, Math.round(height * scale)) }
}
