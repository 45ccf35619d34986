/**
 * Times as the product shows them: ISO-style dates, a 24-hour clock and the zone
 * said, in the viewer's zone unless one is given ("2026-12-02 13:33 CET").
 */
export type TimeStyle = {
  timeZone?: string;
  seconds?: boolean;
  date?: boolean;
  /** false where the zone is said once nearby (a chart's axis) */ zoneName?: boolean;
};

export function formatTime(at: string | number | Date, style: TimeStyle = {}): string {
  const d = at instanceof Date ? at : new Date(at);
  if (Number.isNaN(d.getTime())) return '–';
  const parts = new Intl.DateTimeFormat('en-GB', {
    timeZone: style.timeZone,
    hourCycle: 'h23',
    year: 'numeric',
    month: '2-digit',
    day: '2-digit',
    hour: '2-digit',
    minute: '2-digit',
    second: style.seconds ? '2-digit' : undefined,
    timeZoneName: 'short',
  }).formatToParts(d);
  const p = (t: Intl.DateTimeFormatPartTypes) => parts.find((x) => x.type === t)?.value ?? '';
  const clock = `${p('hour')}:${p('minute')}${style.seconds ? `:${p('second')}` : ''}`;
  const day = style.date === false ? '' : `${p('year')}-${p('month')}-${p('day')} `;
  return style.zoneName === false ? `${day}${clock}` : `${day}${clock} ${p('timeZoneName')}`;
}

/** The clock only, for times within today ("13:33 CET"). */
export const formatClock = (at: string | number | Date, style: Omit<TimeStyle, 'date'> = {}) =>
  formatTime(at, { ...style, date: false });

/** The short name of a zone at an instant ("CET", "AKST", or "GMT+5:45" where there is none). */
export const zoneName = (timeZone: string, at: number | Date = Date.now()) =>
  formatTime(at, { timeZone, date: false }).split(' ').slice(1).join(' ');

const partsCache = new Map<string, Intl.DateTimeFormat>();
function wallClock(at: number, timeZone: string) {
  let f = partsCache.get(timeZone);
  if (!f) {
    f = new Intl.DateTimeFormat('en-GB', {
      timeZone,
      hourCycle: 'h23',
      year: 'numeric',
      month: '2-digit',
      day: '2-digit',
      hour: '2-digit',
      minute: '2-digit',
      second: '2-digit',
    });
    partsCache.set(timeZone, f);
  }
  const p: Record<string, number> = {};
  for (const x of f.formatToParts(at)) if (x.type !== 'literal') p[x.type] = Number(x.value);
  return { y: p.year, m: p.month, d: p.day, h: p.hour, min: p.minute, s: p.second };
}

/** How far a zone's clock runs ahead of UTC at an instant, in minutes (−600 for Hawaii, +345 for Nepal). */
export function zoneOffsetMinutes(timeZone: string, at: number | Date): number {
  const ms = typeof at === 'number' ? at : at.getTime();
  const w = wallClock(ms, timeZone);
  return Math.round((Date.UTC(w.y, w.m - 1, w.d, w.h, w.min, w.s) - Math.floor(ms / 1000) * 1000) / 60_000);
}

/** The calendar day ("2026-12-03") an instant falls on in a zone. */
export function localDay(at: number | Date, timeZone: string): string {
  const w = wallClock(typeof at === 'number' ? at : at.getTime(), timeZone);
  return `${w.y}-${String(w.m).padStart(2, '0')}-${String(w.d).padStart(2, '0')}`;
}

/**
 * The instant a local calendar day ("2026-12-03") starts in a zone. Where a
 * daylight-saving change skips midnight, the day starts at the first instant that exists.
 */
export function startOfLocalDay(day: string, timeZone: string): number {
  const [y, m, d] = day.split('-').map(Number);
  const wall = Date.UTC(y, m - 1, d);
  let guess = wall - zoneOffsetMinutes(timeZone, wall) * 60_000;
  // the offset at the guess may differ from the offset at the wall time; settle it
  for (let i = 0; i < 2; i++) guess = wall - zoneOffsetMinutes(timeZone, guess) * 60_000;
  if (localDay(guess, timeZone) !== day) guess += 3_600_000;
  return guess;
}

/** The start of the local day an instant falls in, in a zone: "today" at a site. */
export const startOfDayAt = (at: number | Date, timeZone: string) => startOfLocalDay(localDay(at, timeZone), timeZone);
