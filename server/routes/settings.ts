import { Router } from 'express';

import { settingsSchema } from '../../telemetry/api';
import { allow, signedIn } from '../auth';
import { doc } from '../http/meta';
import { typed } from '../http/route';
import type { SettingsService } from '../services/settings';

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
