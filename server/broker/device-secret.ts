import crypto from 'node:crypto';
import fs from 'node:fs';
import path from 'node:path';

import argon2 from 'argon2';

/**
 * Controller secrets are random (≥ 128 bits), so a keyed hash is enough to store
 * them and verifies in microseconds: HMAC-SHA-256 under a server key. Slow hashes
 * (argon2) stay for people's passwords, which are chosen by people (the OWASP
 * Password Storage Cheat Sheet draws the same line). Older argon2 hashes still
 * verify, and are replaced on the next successful connect.
 */
const prefix = 'hmac-sha256$';

export type DeviceSecrets = {
  hash: (secret: string) => string;
  verify: (stored: string, secret: string) => Promise<{ ok: boolean; rehash: string | null }>;
};

export function deviceSecrets(key: Buffer): DeviceSecrets {
  const mac = (secret: string) => crypto.createHmac('sha256', key).update(secret, 'utf8').digest();
  // old argon2 hashes cost ~150–200 ms each: at most two at a time, so a reconnect storm is paced, never piled up
  const slow = pace(2);
  return {
    hash: (secret) => prefix + mac(secret).toString('base64url'),
    async verify(stored, secret) {
      if (stored.startsWith(prefix)) {
        const want = Buffer.from(stored.slice(prefix.length), 'base64url');
        const got = mac(secret);
        return { ok: want.length === got.length && crypto.timingSafeEqual(want, got), rehash: null };
      }
      const ok = await slow(() => argon2.verify(stored, secret)).catch(() => false);
      return { ok, rehash: ok ? prefix + mac(secret).toString('base64url') : null };
    },
  };
}

/** DEVICE_KEY (hex or base64, ≥ 32 bytes) or a key kept in the data folder, made once. */
export function loadDeviceKey(configured: string | undefined, dataDir: string): Buffer {
  if (configured) {
    const key = /^[0-9a-f]+$/i.test(configured) ? Buffer.from(configured, 'hex') : Buffer.from(configured, 'base64');
    if (key.length < 32) throw new Error('DEVICE_KEY must hold at least 32 bytes (64 hex digits)');
    return key;
  }
  const file = path.join(dataDir, 'device-key');
  try {
    return Buffer.from(fs.readFileSync(file, 'utf8').trim(), 'hex');
  } catch {
    fs.mkdirSync(dataDir, { recursive: true });
    const key = crypto.randomBytes(32);
    // wx: two processes starting at once keep the first key
    try {
      fs.writeFileSync(file, key.toString('hex'), { mode: 0o600, flag: 'wx' });
      return key;
    } catch {
      return Buffer.from(fs.readFileSync(file, 'utf8').trim(), 'hex');
    }
  }
}

/** Runs at most `n` of the given tasks at once; the rest wait their turn in order. */
function pace(n: number) {
  let running = 0;
  const waiting: (() => void)[] = [];
  return async <T>(task: () => Promise<T>): Promise<T> => {
    // a finished task hands its slot straight to the next in line
    if (running >= n) await new Promise<void>((r) => waiting.push(r));
    else running++;
    try {
      return await task();
    } finally {
      const next = waiting.shift();
      if (next) next();
      else running--;
    }
  };
}
