import { PHOTO_FULL_EDGE_PX } from '../schemas/photo'

/** The size a photo is drawn at before it is queued on the phone: the longest edge at most `edge`, never enlarged, the shape kept. */
export function shrunkSize(width: number, height: number, edge = PHOTO_FULL_EDGE_PX): { width: number, height: number } {
  const scale = Math.min(1, edge / Math.max(width, height))
  return { width: Math.max(1, Math.round(width * scale)), height: Math.max(1, Math.round(height * scale)) }
}
