import { AppError, notFound } from '@/server/errors';
import type { auditRepository, peopleRepository, sessionsRepository } from '@/server/repositories/people';
import type { Person } from '@/telemetry/api';
import type { Role } from '@/telemetry/roles';

import type { AuthService } from './auth';

export function peopleService(deps: {
  people: ReturnType<typeof peopleRepository>;
  sessions: ReturnType<typeof sessionsRepository>;
  audit: ReturnType<typeof auditRepository>;
  auth: AuthService;
  /** told when sessions end, so live sockets are checked again */
  sessionsChanged: () => void;
}) {
  return {
    list: () => deps.people.list(),
    async byId(id: number): Promise<Person> {
      const p = await deps.people.byId(id);
      if (!p) throw notFound('Person');
      return p;
    },
    async create(actor: Person, body: { email: string; name: string; role: Role; password: string }): Promise<Person> {
      if (await deps.people.byEmailWithHash(body.email))
        throw new AppError('conflict', 'Someone already has that e-mail address');
      const id = await deps.people.create({ ...body, passwordHash: await deps.auth.hashPassword(body.password) });
      const person = (await deps.people.byId(id))!;
      await deps.audit.record({ personId: actor.id, action: 'person.create', subject: `person:${id}`, after: person });
      return person;
    },
    async update(
      actor: Person,
      id: number,
      patch: Partial<{ name: string; role: Role; active: boolean }>,
    ): Promise<Person> {
      const before = await deps.people.byId(id);
      if (!before) throw notFound('Person');
      if (id === actor.id && (patch.active === false || (patch.role && patch.role !== 'admin'))) {
        throw new AppError('bad_request', 'You cannot deactivate yourself or drop your own admin role');
      }
      // the wall screen's sign-in never expires: it stays view-only for good
      if (before.role === 'kiosk' && patch.role && patch.role !== 'kiosk') {
        throw new AppError('bad_request', 'A wall-screen sign-in stays view-only; invite a person for any other role', [
          { path: 'role', message: 'Wall screens stay view-only' },
        ]);
      }
      await deps.people.update(id, patch);
      if (patch.active === false || (patch.role && patch.role !== before.role)) {
        await deps.sessions.removeFor(id);
        deps.sessionsChanged();
      }
      const after = (await deps.people.byId(id))!;
      await deps.audit.record({ personId: actor.id, action: 'person.update', subject: `person:${id}`, before, after });
      return after;
    },
  };
}
