import { Redirect, useLocalSearchParams } from 'expo-router';

import { useMe } from '@/components/data/session';
import { SignInForm } from '@/components/session/sign-in-form';

export default function SignIn() {
  const me = useMe();
  const { next } = useLocalSearchParams<{ next?: string }>();
  const asked = typeof next === 'string' && next.startsWith('/') && !next.startsWith('//') ? next : null;
  // a wall-screen account opens the wall mode unless it asked for a page
  if (me.data) return <Redirect href={(asked ?? (me.data.role === 'kiosk' ? '/wall' : '/')) as '/'} />;
  return <SignInForm />;
}
