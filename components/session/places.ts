import type { Action } from '@/telemetry/roles';

export type Place = { href: string; label: string; action: Action };

/** Every place, most used first: the phone's tab bar shows the first four a person may open. */
export const places: Place[] = [
  { href: '/', label: 'Board', action: 'sites.read' },
  { href: '/alarms', label: 'Alarms', action: 'alarms.read' },
  { href: '/visits', label: 'Site visits', action: 'visits.read' },
  { href: '/sites', label: 'Sites', action: 'sites.read' },
  { href: '/controllers', label: 'Controllers', action: 'controllers.read' },
  { href: '/rules', label: 'Rules', action: 'rules.read' },
  { href: '/reports', label: 'Reports', action: 'reports.read' },
  { href: '/calculators', label: 'Calculators', action: 'calculators.use' },
  { href: '/people', label: 'People', action: 'people.read' },
];
