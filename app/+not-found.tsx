import { Link } from 'expo-router';

import { Screen } from '@/components/ui/screen';
import { Text } from '@/components/ui/text';

export default function NotFound() {
  return (
    <Screen title="Not found">
      <Text>There is nothing at this address.</Text>
      <Link href="/">
        <Text strong>Back to the Board</Text>
      </Link>
    </Screen>
  );
}
