import { useLocalSearchParams } from 'expo-router';
import { useState } from 'react';
import { View } from 'react-native';

import { useBoard } from '@/components/data/board';
import { useSiteLive } from '@/components/data/live';
import { useEffectiveRules } from '@/components/data/readings';
import { useRules } from '@/components/data/rules';
import { useMe } from '@/components/data/session';
import { useSites } from '@/components/data/sites';
import { RuleEditor } from '@/components/rules/rule-editor';
import { space } from '@/components/theme/tokens';
import { Choice } from '@/components/ui/choice';
import { QueryState } from '@/components/ui/query-state';
import { Screen } from '@/components/ui/screen';
import { Text } from '@/components/ui/text';
import { can } from '@/telemetry/roles';

export default function RulesRoute() {
  const params = useLocalSearchParams<{ controller?: string; rule?: string }>();
  const me = useMe();
  const sites = useSites();
  const board = useBoard();
  const [siteId, setSiteId] = useState<number | null>(null);
  const fromParam = params.controller ? Number(params.controller) : null;
  const paramSite = board.data?.find((s) => s.controllers.some((c) => c.id === fromParam))?.siteId ?? null;
  const site = siteId ?? paramSite ?? sites.data?.[0]?.id ?? null;
  const live = useSiteLive(site ?? 0);
  const controllers = live?.controllers ?? [];
  const [picked, setPicked] = useState<number | null>(null);
  const controllerId =
    picked ?? (fromParam && controllers.some((c) => c.id === fromParam) ? fromParam : (controllers[0]?.id ?? null));
  const controller = controllers.find((c) => c.id === controllerId);
  const effective = useEffectiveRules(controllerId);
  const rules = useRules();
  return (
    <Screen title="Rules">
      <Text muted>
        Each rule applies from the most specific place that has one: controller, then antenna, then site, then all
        sites. Thresholds are site practice, not standards: tune them to the antenna and the transmitter.
      </Text>
      {sites.data ? (
        <Choice
          label="Site"
          searchLabel="Find a site"
          value={site}
          onChange={(s) => {
            setSiteId(s);
            setPicked(null);
          }}
          options={sites.data.map((s) => ({ value: s.id, label: s.name }))}
        />
      ) : null}
      {controllers.length > 1 ? (
        <Choice
          label="Controller"
          value={controllerId}
          onChange={setPicked}
          options={controllers.map((c) => ({ value: c.id, label: c.serial }))}
        />
      ) : null}
      <QueryState query={effective}>
        {(list) => (
          <View style={{ gap: space.md }}>
            {list
              .filter((e) => e.rule)
              .map((e) => (
                <RuleEditor
                  key={`${controllerId}-${e.kind}`}
                  effective={e.rule!}
                  all={rules.data ?? []}
                  place={{ controllerId: controllerId!, siteId: site!, antennaId: controller?.antennaId ?? null }}
                  canWrite={can(me.data?.role, 'rules.write')}
                  initiallyOpen={params.rule === e.kind}
                  timeZone={sites.data?.find((x) => x.id === site)?.timeZone}
                />
              ))}
          </View>
        )}
      </QueryState>
    </Screen>
  );
}
