// Demo photos for the measured visit: drawn pictures (no real place or person), encoded as the
// upload route would store them (JPEG, no metadata, with a thumbnail), through the same store.
import { randomUUID } from 'node:crypto'
import sharp from 'sharp'
import * as schema from '../server/db/schema'
import { newObjectKey, useObjectStore } from '../server/utils/storage'
import type { Tx } from './visit'

function picture(title: string, base: string, mark: string) {
  return Buffer.from(`<svg xmlns="http://www.w3.org/2000/svg" width="1200" height="900">
  <defs><linearGradient id="g" x1="0" y1="0" x2="1" y2="1"><stop offset="0" stop-color="${base}"/><stop offset="1" stop-color="#E6EAEE"/></linearGradient></defs>
  <rect width="1200" height="900" fill="url(#g)"/>
  <path d="M180 620 C 320 520, 460 700, 640 600 S 900 520, 1020 640 L 1020 820 L 180 820 Z" fill="${mark}" opacity="0.55"/>
  <rect x="420" y="120" width="360" height="300" fill="#F4F6F8" stroke="#45535F" stroke-width="14"/>
  <text x="60" y="90" font-family="sans-serif" font-size="48" fill="#26313B">${title}</text>
  <text x="60" y="870" font-family="sans-serif" font-size="30" fill="#45535F">Setwell demo photo</text>
</svg>`)
}

export async function seedPhotos(tx: Tx, o: { firmId: string, visitId: string, surfaceId: string, uploadedBy: string }) {
  const store = useObjectStore()
  const shots = [
    { caption: 'Blown plaster below the window', base: '#EDC8BB', mark: '#7F4234', surfaceId: o.surfaceId },
    { caption: 'The whole room from the door', base: '#F6E4DD', mark: '#B5654F', surfaceId: null },
  ]
  for (const shot of shots) {
    const source = await sharp(picture(shot.caption, shot.base, shot.mark)).jpeg({ quality: 82 }).toBuffer()
    const full = await sharp(source).jpeg({ quality: 82 }).toBuffer({ resolveWithObject: true })
    const thumb = await sharp(source).resize({ width: 400, height: 400, fit: 'inside' }).jpeg({ quality: 80 }).toBuffer()
    const storageKey = newObjectKey('photos', o.firmId, '.jpg')
    const thumbKey = newObjectKey('photos', o.firmId, '.jpg')
    await store.put(storageKey, full.data)
    await store.put(thumbKey, thumb)
    await tx.insert(schema.photos).values({
      firmId: o.firmId, id: randomUUID(), storageKey, thumbKey, contentType: 'image/jpeg', width: full.info.width, height: full.info.height,
      bytes: full.data.length, originalName: 'demo.jpg', caption: shot.caption, visitId: o.visitId, surfaceId: shot.surfaceId, uploadedBy: o.uploadedBy,
    })
  }
}
