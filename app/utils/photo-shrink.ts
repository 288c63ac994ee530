// A photo taken with no signal waits on the phone until it can be sent. A phone camera's picture
// is 4-12 MB; the server keeps at most PHOTO_FULL_EDGE_PX on the longest edge as a JPEG, so the
// phone shrinks it to that first: less to keep in IndexedDB and far less to send on one bar.
// The browser's own canvas does it (no library: createImageBitmap reads JPEG, PNG and WebP and
// turns the picture upright from its EXIF orientation).
import { shrunkSize } from '#shared/utils/photo-size'

/** The photo as a JPEG no bigger than the server keeps; the original when the phone cannot read it (HEIC on some phones: the server reads it). */
export async function shrinkPhoto(file: File): Promise<Blob> {
  try {
    const bitmap = await createImageBitmap(file, { imageOrientation: 'from-image' })
    const { width, height } = shrunkSize(bitmap.width, bitmap.height)
    const canvas = document.createElement('canvas')
    canvas.width = width
    canvas.height = height
    canvas.getContext('2d')!.drawImage(bitmap, 0, 0, width, height)
    bitmap.close()
    const blob = await new Promise<Blob | null>(resolve => canvas.toBlob(resolve, 'image/jpeg', 0.85))
    return blob ?? file
  }
  catch {
    return file
  }
}
