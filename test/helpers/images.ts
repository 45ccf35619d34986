import zlib from 'node:zlib';

/** A PNG chunk as the PNG specification lays it out: length, type, data, CRC-32 of type and data. */
export function pngChunk(type: string, data: Buffer): Buffer {
  const len = Buffer.alloc(4);
  len.writeUInt32BE(data.length);
  const typed = Buffer.concat([Buffer.from(type, 'latin1'), data]);
  const crc = Buffer.alloc(4);
  crc.writeUInt32BE(zlib.crc32(typed));
  return Buffer.concat([len, typed, crc]);
}

/** A valid 1×1 grey PNG, with extra chunks (text, say) before the image data. */
export function tinyPng(extra: Buffer[] = []): Buffer {
  const ihdr = Buffer.from([0, 0, 0, 1, 0, 0, 0, 1, 8, 0, 0, 0, 0]);
  return Buffer.concat([
    Buffer.from('89504e470d0a1a0a', 'hex'),
    pngChunk('IHDR', ihdr),
    ...extra,
    pngChunk('IDAT', zlib.deflateSync(Buffer.from([0, 0x80]))),
    pngChunk('IEND', Buffer.alloc(0)),
  ]);
}
