import { describe, expect, it } from 'vitest';
import { formatClock, formatTime } from './time';

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
