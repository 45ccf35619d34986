import type { Knex } from 'knex';
import type { Logger } from 'pino';

import type { Outbox } from '@/server/mail/outbox';
import { alarmsRepository } from '@/server/repositories/alarms';
import type { Priority } from '@/telemetry/alarms/machine';
import { ruleLabels } from '@/telemetry/alarms/rules';
import { formatTime } from '@/telemetry/time';

import type { AlarmChange } from './engine';

const paging: Priority[] = ['critical', 'high'];

/**
 * Who hears about an alarm: the site's on-call list in order. A new high or
 * critical alarm e-mails the first person; unacknowledged after the site's
 * escalation time, the next person, and so on down the list.
 */
export function alarmNotifier(db: Knex, mail: Outbox, log: Logger, publicUrl: string) {
  const repo = alarmsRepository(db);
  async function notify(alarmId: number, level: number) {
    const a = await repo.forNotification(alarmId);
    if (!a) return false;
    const person = await repo.onCallAt(a.site_id, level);
    if (!person) return false;
    if (!(await mail.wantsEmail(person.id, a.priority))) return true;
    const link = `${publicUrl}/alarms/${a.id}`;
    await mail.enqueue({
      alarmId,
      personId: person.id,
      to: person.email,
      subject: `[${a.priority.toUpperCase()}] ${a.site_name} (${a.site_code}): ${ruleLabels[a.kind as keyof typeof ruleLabels] ?? a.kind}`,
      body: [
        `${level > 0 ? 'Escalated: not acknowledged in time. ' : ''}${ruleLabels[a.kind as keyof typeof ruleLabels] ?? a.kind} at ${a.site_name}.`,
        // the message carries the value, rounded and with its unit and reference point; times say their zone
        '',
        `Site: ${a.site_name} (${a.site_code})`,
        `Controller: ${a.serial}`,
        `Priority: ${a.priority}`,
        `What: ${a.message}`,
        `When: ${formatTime(a.raised_at, { timeZone: a.time_zone, seconds: true })} at the site (${a.time_zone}), ${formatTime(a.raised_at, { timeZone: 'UTC', seconds: true })}`,
        '',
        `Acknowledge: ${link}`,
      ].join('\n'),
    });
    return true;
  }
  return {
    async onChange(c: AlarmChange) {
      if (!c.transitions.includes('raised') || !paging.includes(c.priority as Priority)) return;
      try {
        await notify(c.alarmId, 0);
      } catch (err) {
        log.warn({ err: (err as Error).message }, 'notification not queued');
      }
    },
    /** Moves unacknowledged paging alarms down the on-call list. */
    async escalate(now = new Date()) {
      const due = await repo.dueForEscalation(now, paging);
      for (const a of due) {
        const level = a.escalation_level + 1;
        await repo.setEscalation(a.id, level);
        await notify(a.id, level);
      }
    },
  };
}
export type AlarmNotifier = ReturnType<typeof alarmNotifier>;
