import { describe, expect, it } from 'vitest';

import { formatClock, formatTime, localDay, startOfDayAt, startOfLocalDay, zoneOffsetMinutes } from './time';

// ISO 8601 calendar date and 24-hour time; zone names as the IANA time zone database and CLDR give them
describe('times on screen', () => {
  it('ISO-style date, 24-hour clock and the zone', () => {
    expect(formatTime('2026-12-02T12:33:30Z', { timeZone: 'UTC' })).toBe('2026-12-02 12:33 UTC');
    expect(formatTime('2026-12-02T00:05:00Z', { timeZone: 'UTC', seconds: true })).toBe('2026-12-02 00:05:00 UTC');
  });

  it('in another zone the date and hour move with it', () => {
    // Stockholm is UTC+1 in winter (CET)
    expect(formatTime('2026-12-02T23:30:00Z', { timeZone: 'Europe/Stockholm' })).toBe('2026-12-03 00:30 CET');
    expect(formatClock('2026-12-02T12:33:30Z', { timeZone: 'UTC' })).toBe('12:33 UTC');
  });

  it('says so when there is no time', () => {
    expect(formatTime('not a time')).toBe('–');
  });
});

// Offsets and daylight-saving dates from the IANA time zone database (tzdata 2025):
// America/Anchorage is UTC−9 (AKST) in winter and UTC−8 (AKDT) from 2026-03-08 02:00 local;
// Asia/Kathmandu is UTC+5:45 all year; Pacific/Auckland is UTC+13 (NZDT) in December;
// America/Havana moves its clocks at 00:00 → 01:00 local on 2026-03-08, so that day has no midnight.
describe('site-local days', () => {
  it('offsets of zones far from UTC, including a 45-minute one', () => {
    expect(zoneOffsetMinutes('America/Anchorage', Date.parse('2026-12-03T12:00:00Z'))).toBe(-540);
    expect(zoneOffsetMinutes('America/Anchorage', Date.parse('2026-07-03T12:00:00Z'))).toBe(-480);
    expect(zoneOffsetMinutes('Asia/Kathmandu', Date.parse('2026-12-03T12:00:00Z'))).toBe(345);
    expect(zoneOffsetMinutes('Pacific/Auckland', Date.parse('2026-12-03T12:00:00Z'))).toBe(780);
  });

  it('the local day of an instant, and the instant a local day starts', () => {
    expect(localDay(Date.parse('2026-12-03T08:59:00Z'), 'America/Anchorage')).toBe('2026-12-02');
    expect(localDay(Date.parse('2026-12-03T09:00:00Z'), 'America/Anchorage')).toBe('2026-12-03');
    expect(new Date(startOfLocalDay('2026-12-03', 'America/Anchorage')).toISOString()).toBe('2026-12-03T09:00:00.000Z');
    expect(new Date(startOfLocalDay('2026-12-03', 'Pacific/Auckland')).toISOString()).toBe('2026-12-02T11:00:00.000Z');
    expect(new Date(startOfLocalDay('2026-12-03', 'Asia/Kathmandu')).toISOString()).toBe('2026-12-02T18:15:00.000Z');
    expect(new Date(startOfDayAt(Date.parse('2026-12-03T05:00:00Z'), 'America/Anchorage')).toISOString()).toBe(
      '2026-12-02T09:00:00.000Z',
    );
  });

  it('days either side of a daylight-saving change, and a day whose midnight does not exist', () => {
    // 2026-03-08 in Anchorage starts at 00:00 AKST (09:00Z); 2026-03-09 at 00:00 AKDT (08:00Z): a 23-hour day
    expect(new Date(startOfLocalDay('2026-03-08', 'America/Anchorage')).toISOString()).toBe('2026-03-08T09:00:00.000Z');
    expect(new Date(startOfLocalDay('2026-03-09', 'America/Anchorage')).toISOString()).toBe('2026-03-09T08:00:00.000Z');
    // Havana skips from 00:00 to 01:00 CDT (UTC−4): the day begins at 01:00 local, 05:00Z
    expect(new Date(startOfLocalDay('2026-03-08', 'America/Havana')).toISOString()).toBe('2026-03-08T05:00:00.000Z');
  });
});
