import type { Knex } from 'knex';
import nodemailer from 'nodemailer';
import type { Logger } from 'pino';

import type { Priority } from '@/telemetry/alarms/machine';

/** E-mail on by default for these priorities until a person chooses otherwise. */
export const defaultEmailFor: Record<Priority, boolean> = { critical: true, high: true, medium: false, low: false };
const maxAttempts = 6;

/**
 * Every message goes through the outbox table; a worker sends what is due with
 * nodemailer and retries failures with exponential backoff. Sending never blocks
 * the alarm engine.
 */
export function outbox(db: Knex, log: Logger, smtp: { host: string; port: number; from: string }) {
  const transport = nodemailer.createTransport({
    host: smtp.host,
    port: smtp.port,
    secure: false,
    ignoreTLS: true,
    connectionTimeout: 5000,
    greetingTimeout: 5000,
    socketTimeout: 10_000,
  });
  let timer: NodeJS.Timeout | null = null;
  let running = false;

  async function wantsEmail(personId: number, priority: Priority): Promise<boolean> {
    const pref = await db('notification_prefs').where({ person_id: personId, priority }).first();
    return pref ? Boolean(pref.email) : defaultEmailFor[priority];
  }

  async function sendDue() {
    if (running) return;
    running = true;
    try {
      const due = await db('outbox')
        .where('status', 'queued')
        .andWhere('next_attempt_at', '<=', new Date())
        .orderBy('id')
        .limit(20);
      for (const m of due) {
        try {
          await transport.sendMail({ from: smtp.from, to: m.to, subject: m.subject, text: m.body });
          await db('outbox')
            .where({ id: m.id })
            .update({
              status: 'sent',
              sent_at: new Date(),
              attempts: m.attempts + 1,
              last_error: null,
              // a one-time link is not kept once it has left
              body: String(m.body).replace(/token=[A-Za-z0-9_-]+/g, 'token=(removed once sent)'),
            });
        } catch (err) {
          const attempts = m.attempts + 1;
          const failed = attempts >= maxAttempts;
          await db('outbox')
            .where({ id: m.id })
            .update({
              attempts,
              status: failed ? 'failed' : 'queued',
              last_error: String((err as Error).message).slice(0, 500),
              next_attempt_at: new Date(Date.now() + 15_000 * 2 ** (attempts - 1)),
            });
          log.warn({ id: m.id, attempts, failed }, 'e-mail not sent; will retry with backoff');
        }
      }
    } catch (err) {
      log.warn({ err: (err as Error).message }, 'outbox pass failed');
    } finally {
      running = false;
    }
  }

  return {
    wantsEmail,
    async enqueue(m: { alarmId: number | null; personId: number | null; to: string; subject: string; body: string }) {
      await db('outbox').insert({
        alarm_id: m.alarmId,
        person_id: m.personId,
        to: m.to,
        subject: m.subject.slice(0, 300),
        body: m.body,
      });
    },
    sendDue,
    /** `when`: among several instances, whether this one is the mail sender now */
    start(everyMs = 2000, when: () => boolean = () => true) {
      timer = setInterval(() => void (when() && sendDue()), everyMs);
    },
    stop() {
      if (timer) clearInterval(timer);
      transport.close();
    },
  };
}
export type Outbox = ReturnType<typeof outbox>;
