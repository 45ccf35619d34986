import { Redirect, useLocalSearchParams } from 'expo-router';

import { useMe } from '@/components/data/session';
import { SignInForm } from '@/components/session/sign-in-form';

export default function SignIn() {
  const me = useMe();
  const { next } = useLocalSearchParams<{ next?: string }>();
  const target = typeof next === 'string' && next.startsWith('/') && !next.startsWith('//') ? next : '/';
  if (me.data) return <Redirect href={target as '/'} />;
  return <SignInForm />;
}
