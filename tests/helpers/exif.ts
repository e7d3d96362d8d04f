import sharp from 'sharp';

/**
 * Reads just enough of an EXIF block to answer "does it point to GPS data?": the TIFF header and the
 * first IFD, looking for the GPS IFD pointer (tag 0x8825). Layout from the TIFF 6.0 specification
 * (header, IFD entries of 12 bytes) and EXIF 2.32 § 4.6.3 (GPSInfo IFD pointer, tag 34853 = 0x8825).
 */
export function exifHasGps(exif: Buffer): boolean {
  const tiff = exif.subarray(0, 6).toString('latin1') === 'Exif\0\0' ? exif.subarray(6) : exif;
  const little = tiff.subarray(0, 2).toString('latin1') === 'II';
  const u16 = (at: number) => (little ? tiff.readUInt16LE(at) : tiff.readUInt16BE(at));
  const u32 = (at: number) => (little ? tiff.readUInt32LE(at) : tiff.readUInt32BE(at));
  if (u16(2) !== 42) throw new Error('not a TIFF header');
  const ifd0 = u32(4);
  const entries = u16(ifd0);
  for (let i = 0; i < entries; i++) {
    if (u16(ifd0 + 2 + i * 12) === 0x8825) return true;
  }
  return false;
}

/** A camera-like JPEG with the place it was taken in its EXIF (an invented bench in Denver). */
export async function photoWithLocation(options: { width?: number; height?: number; colour?: { r: number; g: number; b: number } } = {}) {
  const { width = 1600, height = 1200, colour = { r: 184, g: 134, b: 11 } } = options;
  return sharp({ create: { width, height, channels: 3, background: colour } })
    .withExif({
      IFD0: { Make: 'Benchcam', Model: 'Test phone' },
      IFD3: { GPSLatitudeRef: 'N', GPSLatitude: '39/1 44/1 2112/100', GPSLongitudeRef: 'W', GPSLongitude: '104/1 59/1 2508/100' },
    })
    .jpeg({ quality: 85 })
    .toBuffer();
}
