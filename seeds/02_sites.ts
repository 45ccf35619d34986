import type { Knex } from 'knex';

/** An invented network of transmitter sites in three invented regions. */
type DemoSite = {
  code: string;
  name: string;
  region: string;
  latitude: number;
  longitude: number;
  elevation_m: number;
  tower_height_m: number;
  power_source: 'utility' | 'solar' | 'generator';
  battery_kwh: number | null;
  pv_kwp?: number;
  antennas: {
    name: string;
    service: 'fm' | 'tv' | 'microwave' | 'satellite';
    protection: 'heater' | 'radome' | 'blanket' | 'gas-heater';
    heater_kw: number | null;
  }[];
};

export const demoSites: DemoSite[] = [
  {
    code: 'KTP',
    name: 'Kettle Pike',
    region: 'Northern Uplands',
    latitude: 61.21,
    longitude: 14.02,
    elevation_m: 912,
    tower_height_m: 180,
    power_source: 'utility',
    battery_kwh: null,
    antennas: [
      { name: 'FM main array', service: 'fm', protection: 'heater', heater_kw: 12 },
      { name: 'TV panel stack', service: 'tv', protection: 'radome', heater_kw: null },
    ],
  },
  {
    code: 'BRC',
    name: 'Brindle Crag',
    region: 'Northern Uplands',
    latitude: 61.48,
    longitude: 13.55,
    elevation_m: 1104,
    tower_height_m: 120,
    power_source: 'solar',
    battery_kwh: 60,
    pv_kwp: 6,
    antennas: [
      { name: 'Link dish east', service: 'microwave', protection: 'radome', heater_kw: null },
      { name: 'Link dish west', service: 'microwave', protection: 'blanket', heater_kw: 0.8 },
    ],
  },
  {
    code: 'OXS',
    name: 'Oxlow Summit',
    region: 'Northern Uplands',
    latitude: 60.97,
    longitude: 14.61,
    elevation_m: 788,
    tower_height_m: 150,
    power_source: 'utility',
    battery_kwh: null,
    antennas: [{ name: 'FM standby array', service: 'fm', protection: 'heater', heater_kw: 8 }],
  },
  {
    code: 'GRH',
    name: 'Greyhallow',
    region: 'Northern Uplands',
    latitude: 61.66,
    longitude: 14.3,
    elevation_m: 640,
    tower_height_m: 90,
    power_source: 'generator',
    battery_kwh: 20,
    antennas: [{ name: 'Downlink 3.7 m', service: 'satellite', protection: 'gas-heater', heater_kw: null }],
  },
  {
    code: 'SBF',
    name: 'Sable Fen',
    region: 'Lakelands',
    latitude: 59.82,
    longitude: 15.1,
    elevation_m: 210,
    tower_height_m: 240,
    power_source: 'utility',
    battery_kwh: null,
    antennas: [
      { name: 'TV main slot', service: 'tv', protection: 'heater', heater_kw: 18 },
      { name: 'FM aux array', service: 'fm', protection: 'heater', heater_kw: 6 },
    ],
  },
  {
    code: 'TMK',
    name: 'Tamsin Knoll',
    region: 'Lakelands',
    latitude: 59.64,
    longitude: 15.42,
    elevation_m: 355,
    tower_height_m: 110,
    power_source: 'utility',
    battery_kwh: null,
    antennas: [{ name: 'Downlink 4.5 m', service: 'satellite', protection: 'blanket', heater_kw: 4.5 }],
  },
  {
    code: 'MRW',
    name: 'Marrowind Hill',
    region: 'Lakelands',
    latitude: 59.95,
    longitude: 14.88,
    elevation_m: 420,
    tower_height_m: 160,
    power_source: 'utility',
    battery_kwh: null,
    antennas: [{ name: 'FM main array', service: 'fm', protection: 'heater', heater_kw: 10 }],
  },
  {
    code: 'LQB',
    name: 'Lanquist Barrow',
    region: 'Lakelands',
    latitude: 60.11,
    longitude: 15.67,
    elevation_m: 505,
    tower_height_m: 75,
    power_source: 'solar',
    battery_kwh: 40,
    pv_kwp: 4,
    antennas: [{ name: 'Link dish north', service: 'microwave', protection: 'blanket', heater_kw: 0.6 }],
  },
  {
    code: 'CVB',
    name: 'Corvid Bluff',
    region: 'Saltmarsh Coast',
    latitude: 58.92,
    longitude: 16.2,
    elevation_m: 130,
    tower_height_m: 200,
    power_source: 'utility',
    battery_kwh: null,
    antennas: [{ name: 'TV main slot', service: 'tv', protection: 'heater', heater_kw: 15 }],
  },
  {
    code: 'HLW',
    name: 'Hollin Wick',
    region: 'Saltmarsh Coast',
    latitude: 58.71,
    longitude: 16.55,
    elevation_m: 60,
    tower_height_m: 100,
    power_source: 'utility',
    battery_kwh: null,
    antennas: [{ name: 'FM main array', service: 'fm', protection: 'radome', heater_kw: null }],
  },
  {
    code: 'DNS',
    name: 'Dunmere Spit',
    region: 'Saltmarsh Coast',
    latitude: 58.55,
    longitude: 16.9,
    elevation_m: 25,
    tower_height_m: 60,
    power_source: 'generator',
    battery_kwh: 15,
    antennas: [{ name: 'Downlink 2.4 m', service: 'satellite', protection: 'gas-heater', heater_kw: null }],
  },
  {
    code: 'PEW',
    name: 'Pellow Height',
    region: 'Saltmarsh Coast',
    latitude: 58.83,
    longitude: 16.05,
    elevation_m: 290,
    tower_height_m: 140,
    power_source: 'utility',
    battery_kwh: null,
    antennas: [{ name: 'FM main array', service: 'fm', protection: 'heater', heater_kw: 9 }],
  },
];

export const demoTimeZone = 'Europe/Stockholm';

export async function seed(knex: Knex): Promise<void> {
  for (const { antennas, ...site } of demoSites) {
    const row = await knex('sites').where({ code: site.code }).first();
    if (!row) {
      // the invented network lies in one zone; the tower's feed-line and mount heights are typical, not surveyed
      const [id] = await knex('sites').insert({ ...site, time_zone: demoTimeZone });
      await knex('antennas').insert(
        antennas.map((a) => ({
          ...a,
          site_id: id,
          height_m: Math.round(
            site.tower_height_m * (a.service === 'microwave' || a.service === 'satellite' ? 0.5 : 0.85),
          ),
          feed_loss_db: a.service === 'satellite' ? 0.3 : 1.2,
        })),
      );
    }
  }
  // The demo technician is first on call everywhere, the engineer second.
  const tech = await knex('people').where({ email: 'tech@demo.thawline.test' }).first();
  const eng = await knex('people').where({ email: 'engineer@demo.thawline.test' }).first();
  const sites = await knex('sites').select('id');
  for (const s of sites) {
    for (const [position, person] of [tech, eng].entries()) {
      if (!person) continue;
      await knex('site_on_call')
        .insert({ site_id: s.id, person_id: person.id, position })
        .onConflict(['site_id', 'person_id'])
        .ignore();
    }
  }
}
