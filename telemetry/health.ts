import { z } from 'zod';

/** The system's own health, part by part, as /api/health and /live report it. */
export const partStateSchema = z.enum(['ok', 'degraded', 'down']);
export type PartState = z.infer<typeof partStateSchema>;

export const healthPartSchema = z.object({
  part: z.enum(['database', 'broker', 'ingest', 'alarm-engine', 'mail', 'telemetry']),
  state: partStateSchema,
  message: z.string(),
});
export type HealthPart = z.infer<typeof healthPartSchema>;

export const systemHealthSchema = z.object({
  status: partStateSchema,
  checkedAt: z.string(),
  parts: z.array(healthPartSchema),
});
export type SystemHealth = z.infer<typeof systemHealthSchema>;

const rank: Record<PartState, number> = { ok: 0, degraded: 1, down: 2 };

/** The whole is as bad as its worst part. */
export function overallState(parts: HealthPart[]): PartState {
  return parts.reduce<PartState>((w, p) => (rank[p.state] > rank[w] ? p.state : w), 'ok');
}

/** "40 s", "3 min", "2 h 5 min": how long, for the system strip. */
export function durationWords(ms: number): string {
  const s = Math.max(0, Math.round(ms / 1000));
  if (s < 90) return `${s} s`;
  const m = Math.round(s / 60);
  if (m < 90) return `${m} min`;
  return `${Math.floor(m / 60)} h ${m % 60} min`;
}
