import type { Visit } from '@/components/data/visits';
import { formatClock } from '@/telemetry/time';

/** "Ada Ferrand until 14:30 CET", or "Ada Ferrand, due out 14:30 CET, overdue" once that time has passed. */
export function onSiteWords(v: Pick<Visit, 'person' | 'expectedOutAt'>, timeZone: string | undefined, now: number) {
  if (!v.expectedOutAt) return v.person;
  const at = formatClock(v.expectedOutAt, { timeZone });
  return Date.parse(v.expectedOutAt) < now ? `${v.person}, due out ${at}, overdue` : `${v.person} until ${at}`;
}

/** Whether anyone at a site has stayed past the time they gave. */
export const anyOverdue = (visits: Pick<Visit, 'expectedOutAt'>[], now: number) =>
  visits.some((v) => v.expectedOutAt != null && Date.parse(v.expectedOutAt) < now);
