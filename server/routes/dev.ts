import { Router } from 'express';

import { allow } from '@/server/auth';
import { doc } from '@/server/http/meta';
import { readCaughtMail } from '@/server/mail/dev-outbox';

/** Development only (never mounted in production): the mail the local catcher caught. */
export function devRouter(mailDir: string): Router {
  const r = Router();
  r.get(
    '/outbox',
    allow('outbox.read'),
    doc('Every e-mail the development SMTP catcher caught, newest first'),
    async (_req, res) => {
      res.json({ messages: await readCaughtMail(mailDir) });
    },
  );
  return r;
}
