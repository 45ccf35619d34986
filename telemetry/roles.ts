import { z } from 'zod';

/** People's roles. `kiosk` is a wall-screen sign-in with view-only rights. */
export const roles = ['admin', 'engineer', 'operator', 'technician', 'integrator', 'kiosk'] as const;
export const roleSchema = z.enum(roles);
export type Role = z.infer<typeof roleSchema>;

/**
 * Every action a route can guard. One table decides who may do what; the server
 * checks it in one middleware and the client reads it to hide what a person cannot do.
 */
const table = {
  'sites.read': ['admin', 'engineer', 'operator', 'technician', 'integrator', 'kiosk'],
  'sites.write': ['admin', 'engineer'],
  'controllers.read': ['admin', 'engineer', 'operator', 'technician', 'integrator'],
  'controllers.enrol': ['admin', 'integrator'],
  'controllers.calibrate': ['admin', 'integrator', 'engineer'],
  'controllers.move': ['admin', 'integrator', 'engineer'],
  'controllers.diagnose': ['admin', 'integrator', 'engineer'],
  'readings.read': ['admin', 'engineer', 'operator', 'technician', 'integrator', 'kiosk'],
  'people.read': ['admin'],
  'people.write': ['admin'],
  // development only: what the local SMTP catcher caught
  'outbox.read': ['admin'],
  'alarms.read': ['admin', 'engineer', 'operator', 'technician', 'integrator', 'kiosk'],
  'alarms.ack': ['admin', 'engineer', 'operator', 'technician'],
  'alarms.shelve': ['admin', 'engineer', 'operator'],
  'alarms.service': ['admin', 'engineer'],
  'rules.read': ['admin', 'engineer', 'operator'],
  'rules.write': ['admin', 'engineer'],
  'heater.command': ['admin', 'engineer'],
  'reports.read': ['admin', 'engineer', 'operator'],
  'exports.read': ['admin', 'engineer'],
  // the wall screen shows who is on site, with their expected leaving time
  'visits.read': ['admin', 'engineer', 'operator', 'technician', 'kiosk'],
  'visits.write': ['admin', 'engineer', 'technician'],
  'calculators.use': ['admin', 'engineer', 'operator', 'technician', 'integrator', 'kiosk'],
} as const satisfies Record<string, readonly Role[]>;

export type Action = keyof typeof table;
export const actions = Object.keys(table) as Action[];

export function can(role: Role | null | undefined, action: Action): boolean {
  if (!role) return false;
  return (table[action] as readonly Role[]).includes(role);
}

export const roleLabels: Record<Role, string> = {
  admin: 'Administrator',
  engineer: 'Engineer',
  operator: 'Operator',
  technician: 'Technician',
  integrator: 'Integrator',
  kiosk: 'Wall screen (view only)',
};
