import { Link } from 'expo-router';
import { useEffect, useRef, useState } from 'react';
import { View } from 'react-native';

import { useBoard } from '@/components/data/board';
import { useLiveConnection, useSiteLive } from '@/components/data/live';
import {
  energyWords,
  type RangeKey,
  ranges,
  useEffectiveRules,
  useEnergy,
  useHistory,
} from '@/components/data/readings';
import { useHazard } from '@/components/data/visits';
import { SiteManage } from '@/components/sites/site-manage';
import { space } from '@/components/theme/tokens';
import { Button } from '@/components/ui/button';
import { Choice } from '@/components/ui/choice';
import { QueryState } from '@/components/ui/query-state';
import { Card } from '@/components/ui/screen';
import { Text } from '@/components/ui/text';
import type { Person, ReadingPoint, Site } from '@/telemetry/api';
import { siteCondition } from '@/telemetry/board';
import type { LiveReading } from '@/telemetry/live';
import { dewPointC, frostPointC } from '@/telemetry/math/psychrometrics';
import { vswrWords } from '@/telemetry/math/rf';
import { can } from '@/telemetry/roles';
import { formatClock, formatTime, startOfDayAt, zoneName } from '@/telemetry/time';

import { Band } from './bands';
import { livePoint, withLiveTail } from './chart-window';
import { HazardCard } from './hazard-card';
import { VswrChart } from './vswr-chart';

export function SiteDetail({ site, me }: { site: Site; me: Person }) {
  useBoard();
  const live = useSiteLive(site.id);
  const controllers = live?.controllers ?? [];
  const [picked, setPicked] = useState<number | null>(null);
  const controllerId = picked ?? controllers[0]?.id ?? null;
  const controller = controllers.find((c) => c.id === controllerId);
  const antenna = site.antennas.find((a) => a.id === controller?.antennaId);
  const [range, setRangeKey] = useState<RangeKey>('15m');
  const [zoom, setZoom] = useState<[number, number] | null>(null);
  const setRange = (r: RangeKey) => {
    setRangeKey(r);
    setZoom(null);
  };
  const [width, setWidth] = useState(0);
  const pts = Math.max(100, Math.min(2000, Math.round(width)));
  const history = useHistory(controllerId, range, pts);
  const zoomed = useHistory(controllerId, range, pts, { span: zoom });
  const day = useHistory(controllerId, '24h', 1440);
  const rules = useEffectiveRules(controllerId);
  const warning = rules.data?.find((r) => r.kind === 'vswr-warning')?.rule;
  const trip = rules.data?.find((r) => r.kind === 'vswr-trip')?.rule;
  const cond = siteCondition(live?.controllers ?? []);
  const latest = live?.controllers.find((c) => c.id === controllerId)?.latest;
  const liveRange = range === '15m' || range === '1h';
  const tail = useLiveTail(liveRange ? controllerId : null, latest ?? null);
  // the link came back: what was missed while it was down is fetched, not guessed
  const conn = useLiveConnection();
  const wasOpen = useRef(conn === 'open');
  const { refetch } = history;
  useEffect(() => {
    if (conn === 'open' && !wasOpen.current) void refetch();
    wasOpen.current = conn === 'open';
  }, [conn, refetch]);
  const hazard = useHazard(site.id);

  return (
    <View style={{ gap: space.md }} onLayout={(e) => setWidth(e.nativeEvent.layout.width - space.lg * 2)}>
      {hazard.data?.present && hazard.data.radiusM != null ? (
        <HazardCard hazard={{ ...hazard.data, radiusM: hazard.data.radiusM }} />
      ) : null}
      {controllers.length > 1 ? (
        <Choice
          label="Controller"
          value={controllerId}
          onChange={setPicked}
          options={controllers.map((c) => ({
            value: c.id,
            label: `${c.serial} · ${site.antennas.find((a) => a.id === c.antennaId)?.name ?? c.kind}`,
          }))}
        />
      ) : null}
      <Card>
        <View style={{ flexDirection: 'row', flexWrap: 'wrap', justifyContent: 'space-between', gap: space.sm }}>
          <Text variant="title" role="heading" aria-level={2}>
            VSWR at the antenna
          </Text>
          {can(me.role, 'rules.write') && controllerId ? (
            <Link href={`/rules?controller=${controllerId}&rule=vswr-warning`}>
              <Text strong>Tune thresholds</Text>
            </Link>
          ) : null}
        </View>
        <Choice
          label="Range"
          value={range}
          onChange={setRange}
          options={ranges.map((r) => ({ value: r.key, label: r.label }))}
        />
        <QueryState query={history}>
          {(whole) => {
            // the window: a zoomed span as fetched for it; else the range, sliding with /live
            const span = ranges.find((x) => x.key === range)!.ms;
            const liveTo = tail.length ? Math.max(whole.to, Date.parse(tail[tail.length - 1].ts)) : whole.to;
            const h = zoom
              ? (zoomed.data ?? { ...whole, from: zoom[0], to: zoom[1] })
              : liveRange
                ? { ...whole, from: liveTo - span, to: liveTo }
                : whole;
            const points = zoom ? h.points : withLiveTail(whole.points, liveRange ? tail : [], h.from, h.to);
            const zoneWords = `${zoneName(site.timeZone)}, ${site.timeZone}`;
            return (
              <View style={{ gap: space.sm }}>
                <View aria-label="VSWR chart">
                  <VswrChart
                    points={points}
                    width={Math.max(280, width)}
                    from={h.from}
                    to={h.to}
                    warning={warning ? { level: warning.params.limit, priority: warning.priority } : null}
                    trip={trip ? { level: trip.params.limit, priority: trip.priority } : null}
                    timeZone={site.timeZone}
                    onZoom={setZoom}
                  />
                </View>
                {zoom ? (
                  <View style={{ flexDirection: 'row', flexWrap: 'wrap', alignItems: 'center', gap: space.sm }}>
                    <Text strong>
                      Zoomed to {formatTime(zoom[0], { timeZone: site.timeZone, seconds: true })} –{' '}
                      {formatClock(zoom[1], { timeZone: site.timeZone, seconds: true })}
                    </Text>
                    <Button label="Whole range" kind="plain" onPress={() => setZoom(null)} />
                  </View>
                ) : null}
                <Text variant="small" muted>
                  Times in site time ({zoneWords}). Lines: warning {warning ? vswrWords(warning.params.limit) : 'none'}{' '}
                  ({warning?.scope ?? 'no'} rule), trip {trip ? vswrWords(trip.params.limit) : 'none'} (
                  {trip?.scope ?? 'no'} rule). {points.length} {points.length === 1 ? 'point' : 'points'}
                  {points.length
                    ? `, newest ${formatClock(points[points.length - 1].ts, { timeZone: site.timeZone, seconds: true })}`
                    : ''}
                  {h.source !== 'raw' ? `, min–max per ${h.bucketS} s` : ''}
                  {liveRange && !zoom ? ', live' : ''}. Drag across the chart to zoom.
                </Text>
                <Band label="Moisture" points={points} pick={(p) => p.moisture} from={h.from} to={h.to} />
                <Band label="Heater on" points={points} pick={(p) => p.heaterOn} from={h.from} to={h.to} />
                {controller && controller.kind !== 'radome-sensor' ? (
                  <>
                    <RangeEnergy
                      controllerId={controller.id}
                      from={h.from}
                      to={h.to}
                      ratedKw={antenna?.heaterKw ?? null}
                    />
                    {day.data ? (
                      <EnergySummary
                        controllerId={controller.id}
                        points={day.data.points}
                        to={day.data.to}
                        ratedKw={antenna?.heaterKw ?? null}
                        timeZone={site.timeZone}
                      />
                    ) : null}
                  </>
                ) : null}
              </View>
            );
          }}
        </QueryState>
      </Card>
      <Card>
        <Text variant="title" role="heading" aria-level={2}>
          Now
        </Text>
        {latest ? (
          <>
            <Text>
              At the transmitter (coupler): forward {latest.forwardW.toFixed(0)} W · reflected{' '}
              {latest.reflectedW.toFixed(1)} W · at the antenna: VSWR {latest.vswr?.toFixed(2) ?? '–'}:1
            </Text>
            <Text>
              Air {latest.airTempC.toFixed(1)} °C
              {latest.humidityPct
                ? ` · humidity ${latest.humidityPct.toFixed(0)} % · dew point ${dewPointC(latest.airTempC, latest.humidityPct).toFixed(1)} °C · frost point ${frostPointC(latest.airTempC, latest.humidityPct).toFixed(1)} °C`
                : ''}
            </Text>
            <Text>
              Icing {cond.icing} · moisture {latest.moisture ? 'wet' : 'dry'} · heater {latest.heaterOn ? 'on' : 'off'}{' '}
              ({latest.heaterMode}){latest.heaterCurrentA != null ? `, ${latest.heaterCurrentA.toFixed(1)} A` : ''}
              {latest.batteryPct != null ? ` · battery ${latest.batteryPct.toFixed(0)} %` : ''}
            </Text>
          </>
        ) : (
          <Text muted>No reading yet.</Text>
        )}
      </Card>
      <SiteManage site={site} writer={can(me.role, 'sites.write')} />
    </View>
  );
}

/** The readings heard over /live for one controller while this page is open (newest 2,000). */
function useLiveTail(controllerId: number | null, latest: LiveReading | null): ReadingPoint[] {
  // kept as state adjusted while rendering (React's pattern for state that follows a prop)
  const [tail, setTail] = useState<{ id: number | null; points: ReadingPoint[] }>({ id: controllerId, points: [] });
  let next = tail.id === controllerId ? tail : { id: controllerId, points: [] };
  if (controllerId != null && latest && latest.controllerId === controllerId) {
    const last = next.points.at(-1);
    if (!last || last.ts < latest.ts)
      next = { id: controllerId, points: [...next.points.slice(-1999), livePoint(latest)] };
  }
  if (next !== tail) setTail(next);
  return next.points;
}

function RangeEnergy({
  controllerId,
  from,
  to,
  ratedKw,
}: {
  controllerId: number;
  from: number;
  to: number;
  ratedKw: number | null;
}) {
  const e = useEnergy(controllerId, from, to);
  return (
    <Text>
      Heater energy in this range: <Text strong>{energyWords(e.data, ratedKw)}</Text>
    </Text>
  );
}

/** Today since local midnight, and this storm: back from now while moisture keeps coming with gaps under an hour. */
function EnergySummary({
  controllerId,
  points,
  to,
  ratedKw,
  timeZone,
}: {
  controllerId: number;
  points: { ts: string; moisture: boolean | null }[];
  to: number;
  ratedKw: number | null;
  timeZone: string;
}) {
  // "today" is the site's day, in the site's zone
  const midnight = startOfDayAt(to, timeZone);
  let stormStart: number | null = null;
  let lastWet: number | null = null;
  for (let i = points.length - 1; i >= 0; i--) {
    const t = Date.parse(points[i].ts);
    if (!points[i].moisture) {
      if (lastWet != null && lastWet - t > 3_600_000) break;
      continue;
    }
    lastWet = t;
    stormStart = t;
  }
  const today = useEnergy(controllerId, midnight, to);
  const storm = useEnergy(controllerId, stormStart, stormStart == null ? null : to);
  return (
    <Text>
      Today at the site (since {formatTime(midnight, { timeZone })}):{' '}
      <Text strong>{energyWords(today.data, ratedKw)}</Text>
      {stormStart != null ? (
        <>
          {' '}
          · this storm (wet since {formatClock(stormStart, { timeZone })}):{' '}
          <Text strong>{energyWords(storm.data, ratedKw)}</Text>
        </>
      ) : (
        ' · no storm in the last 24 h'
      )}
    </Text>
  );
}
