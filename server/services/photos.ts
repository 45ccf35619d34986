import { fileTypeFromBuffer } from 'file-type';

import { AppError } from '@/server/errors';

/**
 * Photos attached to acknowledgements: the type is read from the content (never
 * the name or the browser's claim), only JPEG and PNG are kept, and metadata that
 * can carry the phone's location (EXIF, XMP, text chunks) is removed before the
 * file is written.
 */
export type Photo = { bytes: Buffer; mime: 'image/jpeg' | 'image/png'; ext: 'jpg' | 'png' };

export async function checkedPhoto(buf: Buffer): Promise<Photo> {
  const t = await fileTypeFromBuffer(buf);
  if (t?.mime === 'image/jpeg') return { bytes: stripJpeg(buf), mime: 'image/jpeg', ext: 'jpg' };
  if (t?.mime === 'image/png') return { bytes: stripPng(buf), mime: 'image/png', ext: 'png' };
  throw new AppError('bad_request', 'The photo must be a JPEG or PNG image', [
    { path: 'photo', message: 'Not a JPEG or PNG image' },
  ]);
}

const invalid = () =>
  new AppError('bad_request', 'The photo is damaged or not a complete image', [
    { path: 'photo', message: 'Damaged image' },
  ]);

/** JPEG without APP1–APP15 (EXIF, XMP, maker notes) and comments; image data untouched (ITU-T T.81 marker layout). */
export function stripJpeg(buf: Buffer): Buffer {
  const out: Buffer[] = [buf.subarray(0, 2)];
  let i = 2;
  while (i + 4 <= buf.length) {
    if (buf[i] !== 0xff) throw invalid();
    const marker = buf[i + 1];
    // start of scan: the rest is entropy-coded data up to the end
    if (marker === 0xda) {
      out.push(buf.subarray(i));
      return Buffer.concat(out);
    }
    const len = buf.readUInt16BE(i + 2);
    if (len < 2 || i + 2 + len > buf.length) throw invalid();
    const dropped = (marker >= 0xe1 && marker <= 0xef) || marker === 0xfe;
    if (!dropped) out.push(buf.subarray(i, i + 2 + len));
    i += 2 + len;
  }
  throw invalid();
}

const keptPngChunks = new Set([
  'IHDR',
  'PLTE',
  'IDAT',
  'IEND',
  'tRNS',
  'gAMA',
  'cHRM',
  'sRGB',
  'iCCP',
  'sBIT',
  'bKGD',
  'pHYs',
]);

/** PNG with only the chunks that draw the image (no eXIf, tEXt, zTXt, iTXt, tIME) (PNG specification, chunk layout). */
export function stripPng(buf: Buffer): Buffer {
  const out: Buffer[] = [buf.subarray(0, 8)];
  let i = 8;
  while (i + 12 <= buf.length) {
    const len = buf.readUInt32BE(i);
    const type = buf.toString('latin1', i + 4, i + 8);
    const end = i + 12 + len;
    if (end > buf.length) throw invalid();
    if (keptPngChunks.has(type)) out.push(buf.subarray(i, end));
    i = end;
    if (type === 'IEND') return Buffer.concat(out);
  }
  throw invalid();
}
