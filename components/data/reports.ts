import { useQuery } from '@tanstack/react-query';

import { api } from './api-client';
import type { HeaterEnergy } from './readings';

export type StormReport = {
  site: { id: number; name: string; code: string; timeZone: string };
  from: string;
  to: string;
  icingStart: string | null;
  icingEnd: string | null;
  heaterKwh: number;
  controllers: {
    id: number;
    serial: string;
    antenna: string | null;
    heaterKw: number | null;
    readings: number;
    warning: number | null;
    trip: number | null;
    /** the levels in force at each moment of the storm, from the rules' history */
    limitSteps: { from: string; warning: number | null; trip: number | null }[];
    peakVswr: number | null;
    peakAt: string | null;
    hoursAboveWarning: number;
    hoursAboveTrip: number;
    heaterHours: number;
    heaterKwh: number | null;
    energy: HeaterEnergy | null;
    batteryLowPct: number | null;
    airTempLowC: number | null;
    timeline: {
      ts: string;
      vswrMax: number | null;
      airTempC: number | null;
      moisture: boolean;
      heaterDuty: number | null;
    }[];
  }[];
  alarms: {
    id: number;
    serial: string;
    kind: string;
    priority: string;
    state: string;
    message: string;
    raisedAt: string;
    ackedAt: string | null;
    ackedBy: string | null;
    secondsToAck: number | null;
  }[];
  commands: {
    id: string;
    serial: string;
    mode: string;
    until: string | null;
    reason: string | null;
    sentAt: string;
    person: string | null;
    resultOk: boolean | null;
    resultMessage: string | null;
  }[];
};

export type HealthReport = {
  total: number;
  averagePer10Min: number;
  maxPer10Min: number;
  verdict: string;
  share10MinOverAcceptable: number;
  benchmarks: {
    acceptablePer10Min: number;
    manageablePer10Min: number;
    floodStartsAbovePer10Min: number;
    priorityShare: Record<string, number>;
  };
  floods: { start: string; end: string; count: number }[];
  chattering: { kind: string; serial: string; controllerId: number; activations: number; mostInOneMinute: number }[];
  fleeting: { kind: string; serial: string; controllerId: number; activations: number; fleeting: number }[];
  stale: { kind: string; serial: string; controllerId: number; raisedAt: string }[];
  top: { kind: string; serial: string; controllerId: number; count: number; share: number }[];
  priorities: Record<string, number>;
  timeToAck: { medianMs: number | null; p90Ms: number | null; unacknowledged: number };
};

export type EnergyReport = {
  tariffPerKwh: number;
  currency: string;
  daily: {
    siteId: number;
    site: string;
    day: string;
    timeZone: string;
    measuredKwh: number;
    estimatedKwh: number;
    gapHours: number;
    heaterHours: number;
    kwh: number;
    cost: number;
    duty: number | null;
    heaters: number;
  }[];
  offGrid: {
    siteId: number;
    name: string;
    batteryKwh: number | null;
    heaterKw: number;
    batteryPct: number | null;
    hoursOfHeating: number | null;
    assumptions: string;
  }[];
};

const q = (o: Record<string, string | number>) =>
  new URLSearchParams(Object.entries(o).map(([k, v]) => [k, String(v)])).toString();

export function useStormReport(site: number | null, from: string, to: string) {
  return useQuery({
    queryKey: ['reports', 'storm', site, from, to],
    enabled: site != null,
    queryFn: async () => (await api<{ report: StormReport }>(`/reports/storm?${q({ site: site!, from, to })}`)).report,
  });
}
export function useHealthReport(from: string, to: string) {
  return useQuery({
    queryKey: ['reports', 'health', from, to],
    queryFn: async () => (await api<{ report: HealthReport }>(`/reports/alarm-health?${q({ from, to })}`)).report,
  });
}
export function useEnergyReport(from: string, to: string) {
  return useQuery({
    queryKey: ['reports', 'energy', from, to],
    queryFn: async () => (await api<{ report: EnergyReport }>(`/reports/energy?${q({ from, to })}`)).report,
  });
}
export const stormCsvUrl = (site: number, from: string, to: string) =>
  `/api/reports/storm.csv?${q({ site, from, to })}`;
export const readingsCsvUrl = (site: number, from: string, to: string) =>
  `/api/reports/readings.csv?${q({ site, from, to })}`;
