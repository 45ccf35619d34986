import { useMutation, useQuery, useQueryClient } from '@tanstack/react-query';

import type { Rule, RuleBody, RuleKind } from '@/telemetry/alarms/rules';

import { api } from './api-client';
import { keys } from './query-keys';

export function useRules() {
  return useQuery({ queryKey: keys.rules.list(), queryFn: async () => (await api<{ rules: Rule[] }>('/rules')).rules });
}

export type PreviewSpan = { from: string; to: string | null; worst: number | null };
/** What a replay of stored readings found for the rule in force and for the proposed settings. */
export type Preview = {
  days: number;
  readings: number;
  basis: string;
  from: string;
  to: string;
  current: number;
  proposed: number;
  levels: { current: number | null; proposed: number | null };
  trace: { ts: string; min: number; max: number }[];
  spans: { current: PreviewSpan[]; proposed: PreviewSpan[] };
};

export function usePreview() {
  return useMutation({
    mutationFn: (v: RuleBody & { kind: RuleKind; controllerId: number; days: 1 | 7 | 30 }) =>
      api<Preview>('/rules/preview', { body: v }),
  });
}

/** Saves into the rule of the chosen scope: edits it when it exists, else creates the override. */
export function useSaveRule() {
  const qc = useQueryClient();
  return useMutation({
    mutationFn: async (v: {
      existing: Rule | null;
      kind: RuleKind;
      scope: Rule['scope'];
      scopeId: number | null;
      body: RuleBody;
    }) => {
      if (v.existing)
        return (await api<{ rule: Rule }>(`/rules/${v.existing.id}`, { method: 'PUT', body: v.body })).rule;
      return (
        await api<{ rule: Rule }>('/rules', { body: { kind: v.kind, scope: v.scope, scopeId: v.scopeId, ...v.body } })
      ).rule;
    },
    onSuccess: () => {
      void qc.invalidateQueries({ queryKey: keys.rules.all });
      // Board tiles judge VSWR against the rules in force
      void qc.invalidateQueries({ queryKey: keys.board });
    },
  });
}
