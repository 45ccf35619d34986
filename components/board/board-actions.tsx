import { Platform } from 'react-native';

import { useLiveConnection } from '@/components/data/live';
import { Badge } from '@/components/ui/badge';
import { Button } from '@/components/ui/button';

/** Live link state and a full-screen toggle for a wall screen. */
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
      {canFull ? (
        <Button
          kind="plain"
          label="Full screen"
          onPress={() => {
            if (document.fullscreenElement) void document.exitFullscreen();
            else void document.documentElement.requestFullscreen();
          }}
        />
      ) : null}
    </>
  );
}
