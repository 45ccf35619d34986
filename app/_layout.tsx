import { QueryClient, QueryClientProvider } from '@tanstack/react-query';
import { useFonts } from 'expo-font';
import { Slot } from 'expo-router';
import { useEffect, useState } from 'react';
import { ActivityIndicator, Platform, View } from 'react-native';

import { palette } from '@/components/theme/palette';

export default function RootLayout() {
  const [client] = useState(() => new QueryClient({ defaultOptions: { queries: { refetchOnWindowFocus: false } } }));
  const [loaded] = useFonts({
    Inter_400Regular: require('../assets/fonts/Inter_400Regular.ttf'),
    Inter_600SemiBold: require('../assets/fonts/Inter_600SemiBold.ttf'),
  });
  useEffect(() => {
    if (Platform.OS !== 'web') return;
    // printed reports: no navigation bar, no buttons, black on white
    const style = document.createElement('style');
    style.textContent = `@media print { [role="navigation"], [role="button"], button { display: none !important; } body { background: ${palette.surface} !important; } }`;
    document.head.appendChild(style);
    return () => style.remove();
  }, []);
  if (!loaded) {
    return (
      <View style={{ flex: 1, backgroundColor: palette.background, justifyContent: 'center' }}>
        <ActivityIndicator color={palette.trace} />
      </View>
    );
  }
  return (
    <QueryClientProvider client={client}>
      <Slot />
    </QueryClientProvider>
  );
}
