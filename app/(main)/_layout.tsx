import { Redirect, Slot, usePathname } from 'expo-router';
import { useRef } from 'react';
import { View } from 'react-native';

import { useMe } from '@/components/data/session';
import { AlarmBanner } from '@/components/session/alarm-banner';
import { NavBar, TabBar } from '@/components/session/nav-bar';
import { SystemStrip } from '@/components/session/system-strip';
import { palette } from '@/components/theme/palette';
import { QueryState } from '@/components/ui/query-state';
import { can } from '@/telemetry/roles';

export default function MainLayout() {
  const me = useMe();
  const path = usePathname();
  // the router settles on '/' until this layout renders its Slot, so keep the address asked for
  const asked = useRef(path);
  return (
    <QueryState query={me}>
      {(person) =>
        person ? (
          <View style={{ flex: 1, backgroundColor: palette.background }}>
            <NavBar person={person} />
            <SystemStrip />
            {can(person.role, 'alarms.read') ? <AlarmBanner /> : null}
            <View style={{ flex: 1 }}>
              <Slot />
            </View>
            <TabBar person={person} />
          </View>
        ) : (
          <Redirect
            href={
              (asked.current && asked.current !== '/'
                ? `/sign-in?next=${encodeURIComponent(asked.current)}`
                : '/sign-in') as '/sign-in'
            }
          />
        )
      }
    </QueryState>
  );
}
