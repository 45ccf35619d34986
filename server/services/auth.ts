import argon2 from 'argon2';
import crypto from 'node:crypto';
import type { Person } from '../../telemetry/api';
import { AppError } from '../errors';
import type { peopleRepository, sessionsRepository } from '../repositories/people';

const sha256 = (s: string) => crypto.createHash('sha256').update(s).digest('hex');

// Verifying against a fixed hash keeps the time of an unknown e-mail like a known one.
let dummyHash: Promise<string> | null = null;

export function authService(deps: {
  people: ReturnType<typeof peopleRepository>;
  sessions: ReturnType<typeof sessionsRepository>;
  sessionDays: number;
}) {
  return {
    async signIn(email: string, password: string): Promise<{ token: string; person: Person; expiresAt: Date }> {
      const found = await deps.people.byEmailWithHash(email);
      if (!found) {
        dummyHash ??= argon2.hash('not-a-real-password');
        await argon2.verify(await dummyHash, password);
        throw new AppError('unauthenticated', 'E-mail or password is not right');
      }
      const ok = await argon2.verify(found.hash, password);
      if (!ok || !found.person.active) throw new AppError('unauthenticated', 'E-mail or password is not right');
      const token = crypto.randomBytes(32).toString('base64url');
      // a wall screen stays signed in: no sign-out by idle for the view-only kiosk role
      const days = found.person.role === 'kiosk' ? 365 : deps.sessionDays;
      const expiresAt = new Date(Date.now() + days * 86_400_000);
      await deps.sessions.create(sha256(token), found.person.id, expiresAt);
      return { token, person: found.person, expiresAt };
    },
    async personForToken(token: string): Promise<Person | null> {
      return deps.sessions.personFor(sha256(token), new Date());
    },
    async signOut(token: string): Promise<void> {
      await deps.sessions.remove(sha256(token));
    },
    hashPassword: (pw: string) => argon2.hash(pw),
  };
}
export type AuthService = ReturnType<typeof authService>;
