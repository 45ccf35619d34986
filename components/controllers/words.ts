import type { Controller } from '@/telemetry/api';

/** Controller kinds in words, for lists and forms (the codes stay in the API). */
export const controllerKindWords: Record<Controller['kind'], string> = {
  heater: 'Heater controller',
  blanket: 'Blanket controller',
  'gas-heater': 'Gas-heater controller',
  'radome-sensor': 'Radome sensor pack',
};
