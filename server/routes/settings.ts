import { doc } from '../http/meta';
import { Router } from 'express';
import { settingsSchema } from '../../telemetry/api';
import { allow, signedIn } from '../auth';
import type { SettingsService } from '../services/settings';
import { validate } from '../validate';

export function settingsRouter(settings: SettingsService): Router {
  const r = Router();
  r.get('/', signedIn(), doc('Site-wide settings'), async (_req, res) => {
    res.json({ settings: await settings.get() });
  });
  r.put('/', allow('people.write'), validate({ body: settingsSchema }), doc('Changes site-wide settings'), async (req, res) => {
    res.json({ settings: await settings.set(req.user!, req.body) });
  });
  return r;
}
