import type { Knex } from 'knex';
import argon2 from 'argon2';

/** Demo sign-ins of the invented scenario; every one shares the demo password. */
export const demoPassword = 'thawline-demo';
export const demoPeople = [
  { email: 'admin@demo.thawline', name: 'Ada Ferrand', role: 'admin' },
  { email: 'engineer@demo.thawline', name: 'Ravi Osterholt', role: 'engineer' },
  { email: 'operator@demo.thawline', name: 'Mina Calloway', role: 'operator' },
  { email: 'tech@demo.thawline', name: 'Jonah Pell', role: 'technician' },
  { email: 'integrator@demo.thawline', name: 'Suki Brandvold', role: 'integrator' },
  { email: 'wall@demo.thawline', name: 'Control room wall', role: 'kiosk' },
] as const;

export async function seed(knex: Knex): Promise<void> {
  const hash = await argon2.hash(demoPassword);
  for (const p of demoPeople) {
    const found = await knex('people').where({ email: p.email }).first();
    if (!found) await knex('people').insert({ ...p, password_hash: hash, active: true });
  }
}
