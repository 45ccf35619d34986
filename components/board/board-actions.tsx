import { router } from 'expo-router';
import { Platform } from 'react-native';

import { useLiveConnection } from '@/components/data/live';
import { Badge } from '@/components/ui/badge';
import { Button } from '@/components/ui/button';

/** Live link state, and wall mode (full screen where the browser allows) for a wall screen. */
export function BoardActions() {
  const conn = useLiveConnection();
  const canFull =
    Platform.OS === 'web' && typeof document !== 'undefined' && !!document.documentElement.requestFullscreen;
  return (
    <>
      {conn === 'open' ? (
        <Badge label="Live" />
      ) : (
        <Badge label={conn === 'connecting' ? 'Connecting…' : 'Live link lost, retrying'} tone="silent" />
      )}
      <Button
        kind="plain"
        label="Wall mode"
        onPress={() => {
          // full screen needs this tap; the wall page itself has no chrome
          if (canFull && !document.fullscreenElement) void document.documentElement.requestFullscreen().catch(() => {});
          router.push('/wall');
        }}
      />
    </>
  );
}
