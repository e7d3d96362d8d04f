import sharp, { type SharpOptions } from 'sharp';
import { PHOTO_MAX_PIXELS } from '../../shared/files/limits.js';

/**
 * The one way the server opens an uploaded picture. Every decode is bounded by PHOTO_MAX_PIXELS, so
 * a small file that unpacks to a huge bitmap (an image bomb) fails at its header instead of taking
 * the process's memory. libvips gets one thread and no operation cache: pictures are decoded once
 * each, and a cache would only hold on to their pixels.
 */
sharp.cache(false);
sharp.concurrency(1);

export function openImage(input: Buffer, options: Omit<SharpOptions, 'limitInputPixels'> = {}) {
  return sharp(input, { ...options, limitInputPixels: PHOTO_MAX_PIXELS });
}

/** True for sharp's refusal of a picture above the pixel limit. */
export function isPixelLimitError(err: unknown): boolean {
  return err instanceof Error && /pixel limit/i.test(err.message);
}

let tail: Promise<unknown> = Promise.resolve();

/**
 * Runs image work one piece at a time in this process (confirming an upload in the API, making a
 * thumbnail in the worker), so several large photos arriving together never sit decoded in memory
 * at once. A failure ends only its own piece of work.
 */
export function oneImageAtATime<T>(work: () => Promise<T>): Promise<T> {
  const run = tail.then(() => work());
  tail = run.catch(() => undefined);
  return run;
}
