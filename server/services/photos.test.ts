import { describe, expect, it } from 'vitest';

import { pngChunk, tinyPng } from '@/test/helpers/images';

import { checkedPhoto, stripJpeg, stripPng } from './photos';

// A JPEG as ITU-T T.81 lays it out: SOI, an APP1 "Exif" segment carrying GPS text, a DQT, then SOS and data to EOI.
const seg = (marker: number, body: Buffer) =>
  Buffer.concat([Buffer.from([0xff, marker]), Buffer.from([(body.length + 2) >> 8, (body.length + 2) & 0xff]), body]);
const jpeg = Buffer.concat([
  Buffer.from([0xff, 0xd8]),
  seg(0xe1, Buffer.concat([Buffer.from('Exif\0\0'), Buffer.from('GPSLatitude 61.21N')])),
  seg(0xdb, Buffer.alloc(65, 1)),
  Buffer.from([0xff, 0xda, 0x00, 0x08, 1, 2, 3, 4, 5, 6, 0x11, 0x22, 0xff, 0xd9]),
]);

// a 1×1 PNG with a tEXt chunk naming a place
const png = tinyPng([pngChunk('tEXt', Buffer.from('Location\0Kettle Pike'))]);

describe('photos', () => {
  it('removes EXIF from a JPEG and keeps the image data', () => {
    const out = stripJpeg(jpeg);
    expect(out.includes(Buffer.from('Exif'))).toBe(false);
    expect(out.includes(Buffer.from('GPSLatitude'))).toBe(false);
    expect(out.subarray(-14)).toEqual(jpeg.subarray(-14));
    expect(out.length).toBe(jpeg.length - (2 + 2 + 6 + 18));
  });

  it('removes text chunks from a PNG and keeps IHDR, IDAT and IEND', () => {
    const out = stripPng(png);
    expect(out.includes(Buffer.from('Kettle Pike'))).toBe(false);
    for (const c of ['IHDR', 'IDAT', 'IEND']) expect(out.includes(Buffer.from(c))).toBe(true);
  });

  it('tells the type from the content: a JPEG header followed by HTML is refused', async () => {
    await expect(
      checkedPhoto(
        Buffer.concat([Buffer.from([0xff, 0xd8, 0xff]), Buffer.from('<html><script>alert(1)</script></html>')]),
      ),
    ).rejects.toThrow(/JPEG or PNG|damaged/);
    await expect(checkedPhoto(Buffer.from('GIF89a......'))).rejects.toThrow(/JPEG or PNG/);
    expect((await checkedPhoto(png)).mime).toBe('image/png');
    expect((await checkedPhoto(jpeg)).mime).toBe('image/jpeg');
  });
});
