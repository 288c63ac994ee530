import { describe, expect, it } from 'vitest'
import { shrunkSize } from '../../shared/utils/photo-size'

describe('shrunkSize: a photo queued on the phone is no bigger than the server keeps (2560 px on the longest edge)', () => {
  // [width, height, expected]: phone camera sizes are common practice (12 MP is 4032 x 3024)
  const cases: [number, number, { width: number, height: number }][] = [
    [4032, 3024, { width: 2560, height: 1920 }], // 12 MP landscape
    [3024, 4032, { width: 1920, height: 2560 }], // the same, upright
    [8000, 6000, { width: 2560, height: 1920 }], // 48 MP
    [2560, 1440, { width: 2560, height: 1440 }], // already the size: unchanged
    [800, 600, { width: 800, height: 600 }], // smaller: never enlarged
    [10000, 3, { width: 2560, height: 1 }], // a sliver keeps at least one pixel
  ]
  it.each(cases)('%i x %i', (w, h, want) => {
    expect(shrunkSize(w, h)).toEqual(want)
  })
})
