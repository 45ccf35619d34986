import { Router } from 'express';

import { allow, signedIn } from '@/server/auth';
import { doc } from '@/server/http/meta';
import { typed } from '@/server/http/route';
import type { SettingsService } from '@/server/services/settings';
import { settingsSchema } from '@/telemetry/api';

export function settingsRouter(settings: SettingsService): Router {
  const r = Router();
  r.get('/', signedIn(), doc('Site-wide settings'), async (_req, res) => {
    res.json({ settings: await settings.get() });
  });
  r.put(
    '/',
    allow('people.write'),
    doc('Changes site-wide settings'),
    ...typed({ body: settingsSchema }, async ({ body, user, res }) => {
      res.json({ settings: await settings.set(user, body) });
    }),
  );
  return r;
}
