/** The one factory of react-query keys. */
export const keys = {
  me: ['me'] as const,
  board: ['board'] as const,
  readings: (controllerId: number, range: string, points: number) => ['readings', controllerId, range, points] as const,
  rules: {
    all: ['rules'] as const,
    list: () => [...keys.rules.all, 'list'] as const,
    effective: (controllerId: number) => [...keys.rules.all, 'effective', controllerId] as const,
  },
  alarms: {
    all: ['alarms'] as const,
    list: (filter: Record<string, string | undefined>) => [...keys.alarms.all, 'list', filter] as const,
    detail: (id: number) => [...keys.alarms.all, 'detail', id] as const,
  },
  sites: {
    all: ['sites'] as const,
    list: () => [...keys.sites.all, 'list'] as const,
    detail: (id: number) => [...keys.sites.all, 'detail', id] as const,
  },
  people: { all: ['people'] as const },
  controllers: {
    all: ['controllers'] as const,
    list: () => [...keys.controllers.all, 'list'] as const,
    detail: (id: number) => [...keys.controllers.all, 'detail', id] as const,
  },
};

export const staleTimes = {
  reference: 5 * 60_000,
  live: 10_000,
} as const;
