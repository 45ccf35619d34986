import { Redirect, useLocalSearchParams } from 'expo-router';
import { SignInForm } from '../components/session/sign-in-form';
import { useMe } from '../components/data/session';

export default function SignIn() {
  const me = useMe();
  const { next } = useLocalSearchParams<{ next?: string }>();
  const target = typeof next === 'string' && next.startsWith('/') && !next.startsWith('//') ? next : '/';
  if (me.data) return <Redirect href={target as '/'} />;
  return <SignInForm />;
}
