import crypto from 'node:crypto';

import argon2 from 'argon2';

import { AppError } from '@/server/errors';
import type { auditRepository, peopleRepository, sessionsRepository } from '@/server/repositories/people';
import type { Person } from '@/telemetry/api';

const sha256 = (s: string) => crypto.createHash('sha256').update(s).digest('hex');

// Verifying against a fixed hash keeps the time of an unknown e-mail like a known one.
let dummyHash: Promise<string> | null = null;

/** how long a named API token lasts before a new one is needed */
export const apiTokenDays = 365;

export function authService(deps: {
  people: ReturnType<typeof peopleRepository>;
  sessions: ReturnType<typeof sessionsRepository>;
  sessionDays: number;
  audit: ReturnType<typeof auditRepository>;
}) {
  const refuse = async (email: string, address: string, personId: number | null) => {
    await deps.audit.record({ personId, action: 'auth.sign-in-failed', subject: `email:${email}`, after: { address } });
    throw new AppError('unauthenticated', 'E-mail or password is not right');
  };
  return {
    async signIn(
      email: string,
      password: string,
      address = '',
    ): Promise<{ token: string; person: Person; expiresAt: Date }> {
      const found = await deps.people.byEmailWithHash(email);
      if (!found) {
        dummyHash ??= argon2.hash('not-a-real-password');
        await argon2.verify(await dummyHash, password);
        return refuse(email, address, null);
      }
      const ok = await argon2.verify(found.hash, password);
      if (!ok || !found.person.active) return refuse(email, address, found.person.id);
      const token = crypto.randomBytes(32).toString('base64url');
      // a wall screen stays signed in: no sign-out by idle for the view-only kiosk role
      const days = found.person.role === 'kiosk' ? 365 : deps.sessionDays;
      const expiresAt = new Date(Date.now() + days * 86_400_000);
      await deps.sessions.create(sha256(token), found.person.id, expiresAt);
      await deps.audit.record({
        personId: found.person.id,
        action: 'auth.sign-in',
        subject: `person:${found.person.id}`,
        after: { address },
      });
      return { token, person: found.person, expiresAt };
    },
    /** a browser session, from the cookie */
    async personForToken(token: string): Promise<Person | null> {
      return deps.sessions.personFor(sha256(token), new Date(), 'browser');
    },
    /** a named API token, from Authorization: Bearer */
    async personForApiToken(token: string): Promise<Person | null> {
      return deps.sessions.personFor(sha256(token), new Date(), 'api');
    },
    async issueApiToken(person: Person, name: string) {
      const token = `tlk_${crypto.randomBytes(32).toString('base64url')}`;
      const id = crypto.randomBytes(9).toString('base64url');
      const expiresAt = new Date(Date.now() + apiTokenDays * 86_400_000);
      await deps.sessions.create(sha256(token), person.id, expiresAt, { name, publicId: id });
      await deps.audit.record({
        personId: person.id,
        action: 'auth.token-issue',
        subject: `person:${person.id}`,
        after: { id, name },
      });
      return { id, name, token, expiresAt: expiresAt.toISOString() };
    },
    apiTokens: async (personId: number) =>
      (await deps.sessions.apiTokens(personId)).map((t) => ({
        id: t.id as string,
        name: t.name as string,
        createdAt: new Date(t.createdAt).toISOString(),
        expiresAt: new Date(t.expiresAt).toISOString(),
      })),
    async revokeApiToken(person: Person, id: string) {
      const n = await deps.sessions.revokeApiToken(person.id, id);
      if (!n) throw new AppError('not_found', 'Token not found');
      await deps.audit.record({
        personId: person.id,
        action: 'auth.token-revoke',
        subject: `person:${person.id}`,
        after: { id },
      });
    },
    /** ends every browser session of a person, this one included */
    async signOutEverywhere(person: Person) {
      await deps.sessions.removeFor(person.id, false);
      await deps.audit.record({
        personId: person.id,
        action: 'auth.sign-out-everywhere',
        subject: `person:${person.id}`,
      });
    },
    async signOut(token: string): Promise<void> {
      await deps.sessions.remove(sha256(token));
    },
    hashPassword: (pw: string) => argon2.hash(pw),
  };
}
export type AuthService = ReturnType<typeof authService>;
