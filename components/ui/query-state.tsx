import type { UseQueryResult } from '@tanstack/react-query';
import type { ReactNode } from 'react';
import { ActivityIndicator, View } from 'react-native';

import { describeError } from '@/components/data/api-client';
import { palette } from '@/components/theme/palette';
import { space } from '@/components/theme/tokens';

import { Button } from './button';
import { Text } from './text';

/** Loading, error with retry, or the content: one way for every screen. */
export function QueryState<T>({ query, children }: { query: UseQueryResult<T>; children: (data: T) => ReactNode }) {
  if (query.isPending) {
    return (
      <View style={{ padding: space.xl }}>
        <ActivityIndicator color={palette.trace} accessibilityLabel="Loading" />
      </View>
    );
  }
  if (query.isError) {
    return (
      <View style={{ gap: space.sm, padding: space.lg }} role="alert">
        <Text>{describeError(query.error)}</Text>
        <Button kind="plain" label="Try again" onPress={() => void query.refetch()} />
      </View>
    );
  }
  return <>{children(query.data as T)}</>;
}
