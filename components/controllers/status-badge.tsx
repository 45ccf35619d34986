import { Badge } from '@/components/ui/badge';
import type { Controller } from '@/telemetry/api';

const words = {
  waiting: 'Waiting for first message',
  online: 'Online',
  silent: 'Silent',
  decommissioned: 'Decommissioned',
} as const;

export function StatusBadge({ status }: { status: Controller['status'] }) {
  return <Badge label={words[status]} tone={status === 'silent' ? 'silent' : 'neutral'} />;
}
