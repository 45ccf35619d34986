import type { Tone } from '@/components/theme/palette';

export const stateWords: Record<string, string> = {
  unacknowledged: 'Unacknowledged',
  acknowledged: 'Acknowledged',
  'rtn-unacknowledged': 'Cleared, not acknowledged',
  shelved: 'Shelved',
  suppressed: 'Suppressed',
  'out-of-service': 'Out of service',
  normal: 'Closed',
};

export const kindWords: Record<string, string> = {
  'vswr-warning': 'VSWR warning level',
  'vswr-trip': 'VSWR trip level',
  'reflected-high': 'Reflected power high',
  'vswr-rising-icing': 'VSWR rising while icing',
  'icing-heater-off': 'Icing, heater off or weak',
  'flame-not-proven': 'Flame not proven',
  silent: 'Controller silent',
  'battery-low-heating': 'Battery low while heating',
  'shedding-advisory': 'Ice may shed',
  'heater-forced-off': 'Heater forced off during icing',
};

export const priorityTone = (p: string): Tone =>
  p === 'critical' ? 'critical' : p === 'high' ? 'high' : p === 'medium' ? 'medium' : 'low';

/** Priority carried by a sign as well as colour: it reads across a room and for colour-blind viewers. */
export const prioritySigns = { critical: '▲▲', high: '▲', medium: '◆', low: '●' } as const;
export const prioritySign = (p: string) => prioritySigns[p as keyof typeof prioritySigns] ?? '';
