import crypto from 'node:crypto';

import type { DeviceSecrets } from './device-secret';

/**
 * Controller credentials for the broker, by canonical (upper-case) serial only. A
 * verified secret is remembered (as a SHA-256) until the password changes or the
 * controller is decommissioned; `forget` clears it.
 */
export type CredentialSource = (
  serial: string,
) => Promise<{ id: number; passwordHash: string; decommissioned: boolean } | null>;

export type ControllerDirectory = {
  verify: (serial: string, password: string) => Promise<{ id: number } | null>;
  forget: (serial: string) => void;
};

const sha = (s: string) => crypto.createHash('sha256').update(s).digest();

export function controllerDirectory(
  source: CredentialSource,
  secrets: DeviceSecrets,
  rehash: (id: number, hash: string) => Promise<void>,
): ControllerDirectory {
  const verified = new Map<string, { id: number; digest: Buffer }>();
  return {
    async verify(serial, password) {
      const cached = verified.get(serial);
      const digest = sha(password);
      if (cached && crypto.timingSafeEqual(cached.digest, digest)) return { id: cached.id };
      const row = await source(serial);
      if (!row || row.decommissioned) return null;
      const v = await secrets.verify(row.passwordHash, password);
      if (!v.ok) return null;
      // a failed upgrade of an old hash must not refuse a right password: it is tried again at the next connect
      if (v.rehash) await rehash(row.id, v.rehash).catch(() => {});
      verified.set(serial, { id: row.id, digest });
      return { id: row.id };
    },
    forget(serial) {
      verified.delete(serial);
    },
  };
}
