/**
 * Times as the product shows them: ISO-style dates, a 24-hour clock and the zone
 * said, in the viewer's zone unless one is given ("2026-12-02 13:33 CET").
 */
export type TimeStyle = { timeZone?: string; seconds?: boolean; date?: boolean };

export function formatTime(at: string | number | Date, style: TimeStyle = {}): string {
  const d = at instanceof Date ? at : new Date(at);
  if (Number.isNaN(d.getTime())) return '–';
  const parts = new Intl.DateTimeFormat('en-GB', {
    timeZone: style.timeZone, hourCycle: 'h23', year: 'numeric', month: '2-digit', day: '2-digit',
    hour: '2-digit', minute: '2-digit', second: style.seconds ? '2-digit' : undefined, timeZoneName: 'short',
  }).formatToParts(d);
  const p = (t: Intl.DateTimeFormatPartTypes) => parts.find((x) => x.type === t)?.value ?? '';
  const clock = `${p('hour')}:${p('minute')}${style.seconds ? `:${p('second')}` : ''}`;
  const day = style.date === false ? '' : `${p('year')}-${p('month')}-${p('day')} `;
  return `${day}${clock} ${p('timeZoneName')}`;
}

/** The clock only, for times within today ("13:33 CET"). */
export const formatClock = (at: string | number | Date, style: Omit<TimeStyle, 'date'> = {}) => formatTime(at, { ...style, date: false });
