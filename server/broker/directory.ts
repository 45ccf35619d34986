import argon2 from 'argon2';
import crypto from 'node:crypto';

/**
 * Controller credentials for the broker. An argon2 verify costs ~150–200 ms, so a
 * verified password is remembered (as a SHA-256) until the password changes or the
 * controller is decommissioned; reconnects then cost microseconds.
 */
export type CredentialSource = (serial: string) => Promise<{ id: number; passwordHash: string; decommissioned: boolean } | null>;

export type ControllerDirectory = {
  verify: (serial: string, password: string) => Promise<{ id: number } | null>;
  forget: (serial: string) => void;
};

const sha = (s: string) => crypto.createHash('sha256').update(s).digest();

export function controllerDirectory(source: CredentialSource): ControllerDirectory {
  const verified = new Map<string, { id: number; digest: Buffer }>();
  return {
    async verify(serial, password) {
      const cached = verified.get(serial);
      const digest = sha(password);
      if (cached && crypto.timingSafeEqual(cached.digest, digest)) return { id: cached.id };
      const row = await source(serial);
      if (!row || row.decommissioned) return null;
      if (!(await argon2.verify(row.passwordHash, password))) return null;
      verified.set(serial, { id: row.id, digest });
      return { id: row.id };
    },
    forget(serial) {
      verified.delete(serial);
    },
  };
}
