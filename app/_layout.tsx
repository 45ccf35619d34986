import { useFonts } from 'expo-font';
import { QueryClient, QueryClientProvider } from '@tanstack/react-query';
import { Slot } from 'expo-router';
import { useState } from 'react';
import { ActivityIndicator, View } from 'react-native';
import { palette } from '../components/theme/palette';

export default function RootLayout() {
  const [client] = useState(() => new QueryClient({ defaultOptions: { queries: { refetchOnWindowFocus: false } } }));
  const [loaded] = useFonts({
    Inter_400Regular: require('../assets/fonts/Inter_400Regular.ttf'),
    Inter_600SemiBold: require('../assets/fonts/Inter_600SemiBold.ttf'),
  });
  if (!loaded) {
    return <View style={{ flex: 1, backgroundColor: palette.background, justifyContent: 'center' }}><ActivityIndicator color={palette.trace} /></View>;
  }
  return (
    <QueryClientProvider client={client}>
      <Slot />
    </QueryClientProvider>
  );
}
