import type { Controller } from '../../telemetry/api';
import { Badge } from '../ui/badge';

const words = {
  waiting: 'Waiting for first message',
  online: 'Online',
  silent: 'Silent',
  decommissioned: 'Decommissioned',
} as const;

export function StatusBadge({ status }: { status: Controller['status'] }) {
  return <Badge label={words[status]} tone={status === 'silent' ? 'silent' : 'neutral'} />;
}
