import argon2 from 'argon2';
import type { Knex } from 'knex';

/** Demo sign-ins of the invented scenario; every one shares the demo password. */
export const demoPassword = 'thawline-demo';
export const demoPeople = [
  { email: 'admin@demo.thawline.test', name: 'Ada Ferrand', role: 'admin' },
  { email: 'engineer@demo.thawline.test', name: 'Ravi Osterholt', role: 'engineer' },
  { email: 'operator@demo.thawline.test', name: 'Mina Calloway', role: 'operator' },
  { email: 'tech@demo.thawline.test', name: 'Jonah Pell', role: 'technician' },
  { email: 'integrator@demo.thawline.test', name: 'Suki Brandvold', role: 'integrator' },
  { email: 'wall@demo.thawline.test', name: 'Control room wall', role: 'kiosk' },
] as const;

export async function seed(knex: Knex): Promise<void> {
  const hash = await argon2.hash(demoPassword);
  for (const p of demoPeople) {
    const found = await knex('people').where({ email: p.email }).first();
    if (!found) await knex('people').insert({ ...p, password_hash: hash, active: true });
  }
}
