import { describe, expect, it } from 'vitest';
import sharp from 'sharp';
import { isPixelLimitError, oneImageAtATime, openImage } from '../../../server/lib/images.js';

/** A single-colour greyscale PNG: a few hundred KB even at hundreds of megapixels. */
const flatPng = (width: number, height: number) =>
  sharp(Buffer.alloc(1, 90), { raw: { width: 1, height: 1, channels: 1 } })
    .resize(width, height, { kernel: 'nearest' })
    .toColourspace('b-w')
    .png({ compressionLevel: 9 })
    .toBuffer();

describe('server/lib/images', () => {
  it('gives libvips one thread and no operation cache once loaded', () => {
    expect(sharp.concurrency()).toBe(1);
    const cache = sharp.cache();
    expect(cache.memory.max).toBe(0);
    expect(cache.items.max).toBe(0);
  });

  it('opens a picture up to 40 megapixels and refuses one above, at its header', async () => {
    const fine = await flatPng(6000, 6000); // 36 MP
    expect(await openImage(fine).metadata()).toMatchObject({ width: 6000, height: 6000, format: 'png' });

    const bomb = await flatPng(7000, 6000); // 42 MP
    const err = await openImage(bomb).metadata().then(() => null, (e: unknown) => e);
    expect(isPixelLimitError(err)).toBe(true);
    await expect(openImage(bomb).resize(100).webp().toBuffer()).rejects.toThrow(/pixel limit/);
  });

  it('runs image work one piece at a time, in order, and a failure does not stop the next', async () => {
    let active = 0;
    let most = 0;
    const done: number[] = [];
    const piece = (n: number, fail = false) =>
      oneImageAtATime(async () => {
        active++;
        most = Math.max(most, active);
        await new Promise((r) => setTimeout(r, 30));
        active--;
        if (fail) throw new Error(`piece ${n} failed`);
        done.push(n);
        return n;
      });
    const results = await Promise.allSettled([piece(1), piece(2, true), piece(3), piece(4)]);
    expect(most).toBe(1);
    expect(done).toEqual([1, 3, 4]);
    expect(results.map((r) => r.status)).toEqual(['fulfilled', 'rejected', 'fulfilled', 'fulfilled']);
  });
});
