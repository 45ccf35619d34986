import argon2 from 'argon2';
import type { Knex } from 'knex';

/** Every demo antenna has a controller; the demo simulator signs in with this password. */
export const demoControllerPassword = 'thawline-demo-controller';

const kindFor = { heater: 'heater', radome: 'radome-sensor', blanket: 'blanket', 'gas-heater': 'gas-heater' } as const;

export async function seed(knex: Knex): Promise<void> {
  const antennas = await knex('antennas as a')
    .join('sites as s', 's.id', 'a.site_id')
    .select('a.id', 'a.site_id', 'a.protection', 's.code')
    .orderBy('a.id');
  let hash: string | null = null;
  const perSite = new Map<string, number>();
  for (const a of antennas) {
    const n = (perSite.get(a.code) ?? 0) + 1;
    perSite.set(a.code, n);
    const serial = `${a.code}-${n}`;
    if (await knex('controllers').where({ serial }).first()) continue;
    hash ??= await argon2.hash(demoControllerPassword);
    const [id] = await knex('controllers').insert({
      serial,
      site_id: a.site_id,
      antenna_id: a.id,
      kind: kindFor[a.protection as keyof typeof kindFor],
      interval_s: 2,
      forward_scale: 1,
      reflected_scale: 1,
      line_loss_db: 0.5,
      password_hash: hash,
    });
    await knex('controller_placements').insert({
      controller_id: id,
      site_id: a.site_id,
      antenna_id: a.id,
      from_at: null,
    });
  }
}
