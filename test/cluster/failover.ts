/**
 * `npm run test:cluster`: the scale-out promises, checked on real parts on loopback —
 * three Thawline processes, a 3-node MariaDB Galera cluster and mosquitto with
 * dynamic security (server/cluster/local.ts). Under steady ingest from every demo
 * controller: kill -9 one instance, then stop the Galera node everyone writes
 * through, then enrol a controller through one instance and see it online through
 * another. Exits 1 when a check fails. Takes about two minutes.
 */
import fs from 'node:fs';
import path from 'node:path';

import { demoControllerPassword } from '@/seeds/03_controllers';
import { startLocalCluster } from '@/server/cluster/local';
import { virtualDevices } from '@/test/bench/devices';
import { freePort } from '@/test/helpers/ports';

const root = path.resolve(__dirname, '../..');
const sleep = (ms: number) => new Promise((r) => setTimeout(r, ms));
const failures: string[] = [];
const check = (ok: boolean, what: string) => {
  console.log(`${ok ? 'ok  ' : 'FAIL'} ${what}`);
  if (!ok) failures.push(what);
};

async function signIn(url: string, email: string) {
  const res = await fetch(`${url}/api/auth/sign-in`, {
    method: 'POST',
    headers: { 'content-type': 'application/json' },
    body: JSON.stringify({ email, password: 'thawline-demo' }),
  });
  const cookie = /thawline_session=[^;]+/.exec(res.headers.get('set-cookie') ?? '')?.[0];
  if (!cookie) throw new Error(`sign-in at ${url} failed (${res.status})`);
  return cookie;
}
const api = async (url: string, cookie: string, p: string, body?: unknown) => {
  const res = await fetch(`${url}/api${p}`, {
    method: body ? 'POST' : 'GET',
    headers: { cookie, 'content-type': 'application/json', origin: url },
    body: body ? JSON.stringify(body) : undefined,
  });
  return { status: res.status, body: (await res.json().catch(() => ({}))) as Record<string, unknown> };
};

/** the answer's body when it is not the one expected (never a password on success) */
const failed = (r: { status: number; body: unknown }, want: number) =>
  r.status === want ? '' : ` ${JSON.stringify(r.body)}`;

async function main() {
  const dir = path.join(root, '.data', 'test-cluster');
  fs.rmSync(dir, { recursive: true, force: true });
  const base = 20_000 + Math.floor(Math.random() * 20) * 100;
  const cluster = await startLocalCluster({
    root,
    dir,
    instances: 3,
    httpPort: base,
    dbPort: base + 10,
    mqttPort: await freePort(),
    smtpPort: await freePort(),
    log: (l) => console.log(`  ${l}`),
  });
  const db = cluster.db;
  const [, b, c] = cluster.urls;
  try {
    const serials = (await db('controllers').where({ decommissioned: false }).pluck('serial')) as string[];
    const fleet = virtualDevices(
      cluster.mqttUrl,
      serials.map((serial) => ({ serial, password: demoControllerPassword })),
      1000,
    );
    await fleet.allConnected();
    const leases = async () =>
      (await db('controller_leases')
        .whereNotNull('holder')
        .andWhere('expires_at', '>', db.fn.now(3))
        .select('controller_id', 'holder', 'fence')) as { controller_id: number; holder: string; fence: number }[];
    const t0 = Date.now();
    while ((await leases()).length < serials.length || new Set((await leases()).map((l) => l.holder)).size < 3) {
      if (Date.now() - t0 > 30_000) throw new Error('controllers not shared out among three instances in 30 s');
      await sleep(200);
    }
    const before = await leases();
    const onFirst = before.filter((l) => l.holder === 'thawline-1');
    console.log(
      `${serials.length} controllers reporting every second, shared out 3 ways (${onFirst.length} on instance 1)`,
    );

    // a detuned antenna on instance 1's side raises one alarm; a heater command goes to it through instance 2
    const victimCtl = (await db('controllers')
      .whereIn(
        'id',
        onFirst.map((l) => l.controller_id),
      )
      .whereIn('kind', ['heater', 'blanket'])
      .first()) as { id: number; serial: string } | undefined;
    if (!victimCtl) throw new Error('instance 1 owns no controller with a heater; run again');
    const device = fleet.devices.find((d) => d.serial === victimCtl.serial)!;
    device.reflectedW = 2000; // 5 kW forward, 2 kW reflected: VSWR far past the trip level
    const operator = await signIn(b, 'engineer@demo.thawline.test');
    const cmd = await api(b, operator, `/controllers/${victimCtl.id}/heater`, {
      mode: 'forced-on',
      untilMinutes: 60,
      reason: 'cluster check',
    });
    check(cmd.status === 202, `heater command accepted through instance 2 (${cmd.status}${failed(cmd, 202)})`);
    const openTrips = () =>
      db('alarms').where({ controller_id: victimCtl.id, kind: 'vswr-trip' }).count<{ n: number }[]>({ n: '*' });
    const tAlarm = Date.now();
    while (Number((await openTrips())[0].n) < 1 && Date.now() - tAlarm < 30_000) await sleep(250);
    check(Number((await openTrips())[0].n) === 1, `one VSWR trip alarm raised for ${victimCtl.serial}`);

    // kill -9 instance 1
    const killedAt = Date.now();
    await cluster.kill(0);
    let takeoverS: number | null = null;
    while (Date.now() - killedAt < 30_000) {
      const now = await leases();
      if (onFirst.every((o) => now.some((l) => l.controller_id === o.controller_id && l.holder !== 'thawline-1'))) {
        takeoverS = (Date.now() - killedAt) / 1000;
        break;
      }
      await sleep(200);
    }
    check(takeoverS != null && takeoverS <= 15, `instance 1's controllers owned again within 15 s (${takeoverS} s)`);
    await sleep(8000);

    // stop the Galera node everyone writes through: ingest carries on through the next
    const storedBefore = Number((await db('readings').count<{ n: number }[]>({ n: '*' }))[0].n);
    await cluster.galera.stopNode(0);
    console.log('Galera node 1 stopped');
    await sleep(12_000);
    const storedAfter = Number((await db('readings').count<{ n: number }[]>({ n: '*' }))[0].n);
    check(
      storedAfter > storedBefore + serials.length * 5,
      `ingest continues with a Galera node down (${storedAfter - storedBefore} readings in 12 s)`,
    );

    // stop sampling, let replays finish, then count
    fleet.stopSampling();
    const sampled = fleet.sampled();
    const settle = Date.now();
    let stored = 0;
    while (Date.now() - settle < 60_000) {
      stored = Number(
        (
          await db('readings')
            .whereIn(
              'boot',
              fleet.devices.map((d) => d.boot),
            )
            .count<{ n: number }[]>({ n: '*' })
        )[0].n,
      );
      if (stored >= sampled) break;
      await sleep(1000);
    }
    const distinct = Number(
      (
        await db('readings')
          .whereIn(
            'boot',
            fleet.devices.map((d) => d.boot),
          )
          .countDistinct<{ n: number }[]>({ n: db.raw('controller_id, boot, seq') })
      )[0].n,
    );
    check(stored === sampled, `0 readings lost (${sampled} sampled, ${stored} stored)`);
    check(distinct === stored, `0 duplicate rows (${stored - distinct})`);
    check(Number((await openTrips())[0].n) === 1, 'still one VSWR trip alarm after the takeover (no duplicate)');
    const sent = [...device.heaterCommands.values()];
    check(sent.length === 1 && sent[0] === 1, `the heater command arrived once (${JSON.stringify(sent)})`);
    await fleet.close();

    // enrol through instance 2, online through instance 3 (instance 1 was killed)
    const admin = await signIn(b, 'admin@demo.thawline.test');
    // ids come from Galera's auto-increment steps (1, 4, 7 … on node 1): ask for one
    const site = (await db('sites').orderBy('id').first('id')) as { id: number };
    const enrol = await api(b, admin, '/controllers', {
      serial: 'CLU-9',
      siteId: site.id,
      kind: 'heater',
      intervalS: 1,
    });
    check(enrol.status === 201, `controller enrolled through instance 2 (${enrol.status}${failed(enrol, 201)})`);
    if (enrol.status !== 201) throw new Error('enrolment failed');
    const creds = enrol.body.mqtt as { username: string; password: string };
    const one = virtualDevices(cluster.mqttUrl, [{ serial: 'CLU-9', password: creds.password }], 1000);
    await one.allConnected(20_000);
    const viewer = await signIn(c, 'operator@demo.thawline.test');
    let status = '';
    const t1 = Date.now();
    while (Date.now() - t1 < 20_000) {
      const r = await api(c, viewer, `/controllers/${String(enrol.body.id)}`);
      status = String((r.body.controller as { status?: string } | undefined)?.status);
      if (status === 'online') break;
      await sleep(500);
    }
    check(status === 'online', `seen online through instance 3 (${status})`);
    await one.close();
  } finally {
    await cluster.stop();
  }
  console.log(failures.length ? `\n${failures.length} check(s) failed` : '\nall checks passed');
  process.exit(failures.length ? 1 : 0);
}

main().catch((err: unknown) => {
  console.error(err);
  process.exit(1);
});
