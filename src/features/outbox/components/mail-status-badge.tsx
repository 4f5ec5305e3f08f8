import { type MailMessage } from '@shared/users';
import { StatusBadge } from '@/components/status-badge';

export function MailStatusBadge({ status }: { status: MailMessage['status'] }) {
  if (status === 'sent') return <StatusBadge tone="good">Sent</StatusBadge>;
  if (status === 'queued') return <StatusBadge tone="pending">Queued</StatusBadge>;
  return <StatusBadge tone="bad">Failed</StatusBadge>;
}
