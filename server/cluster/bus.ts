import { z } from 'zod';

import { liveMessageSchema } from '@/telemetry/live';

/** The topic on which Thawline instances tell each other what changed. */
export const busTopic = 'thawline/cluster/v1/events';

const busMessageSchema = z.object({
  from: z.string(),
  event: z.discriminatedUnion('kind', [
    /** something for every browser: an alarm, a visit, a change to the network */
    z.object({ kind: z.literal('live'), message: liveMessageSchema }),
    /** a person's act stepped an alarm through another instance: its owner reads it again */
    z.object({ kind: z.literal('alarm-source'), source: z.string() }),
    /** a controller was changed, moved or decommissioned: caches forget it */
    z.object({ kind: z.literal('controller-changed'), serial: z.string() }),
    /** sessions were ended or roles changed: every instance checks its /live sockets again */
    z.object({ kind: z.literal('sessions') }),
    /** rules were changed: every engine reads them again */
    z.object({ kind: z.literal('rules') }),
  ]),
});
export type BusEvent = z.infer<typeof busMessageSchema>['event'];

/**
 * The instances' shared bus on the broker they all use: each publishes what its
 * browsers and caches elsewhere must hear, and hears everyone else's (its own
 * messages come back from the broker and are dropped).
 */
export function clusterBus(id: string, publish: (topic: string, payload: string) => Promise<void>) {
  const handlers: ((e: BusEvent) => void)[] = [];
  return {
    send(event: BusEvent) {
      void publish(busTopic, JSON.stringify({ from: id, event })).catch(() => {});
    },
    on(handler: (e: BusEvent) => void) {
      handlers.push(handler);
    },
    receive(payload: Buffer) {
      let m: z.infer<typeof busMessageSchema>;
      try {
        const parsed = busMessageSchema.safeParse(JSON.parse(payload.toString('utf8')));
        if (!parsed.success) return;
        m = parsed.data;
      } catch {
        return;
      }
      if (m.from === id) return;
      for (const h of handlers) h(m.event);
    },
  };
}
export type ClusterBus = ReturnType<typeof clusterBus>;
