import { Fragment, type ReactNode } from 'react';
import { type MailMessage } from '@shared/users';
import { formatCount, formatDateTime } from '@/lib/format';
import { Button } from '@/components/button';
import { Dialog } from '@/components/dialog';
import { MailStatusBadge } from '@/features/outbox/components/mail-status-badge';

const URL_PATTERN = /(https?:\/\/[^\s<>"')]+)/g;

/** Plain text with its web addresses made into links (invitation and reset links are clickable). */
function LinkedText({ text }: { text: string }) {
  const parts = text.split(URL_PATTERN);
  return (
    <>
      {parts.map((part, index) =>
        index % 2 === 1 ? (
          <a key={index} href={part} className="text-court-700 underline">
            {part}
          </a>
        ) : (
          <Fragment key={index}>{part}</Fragment>
        ),
      )}
    </>
  );
}

function Row({ label, children }: { label: string; children: ReactNode }) {
  return (
    <div className="grid grid-cols-[7rem_1fr] gap-3 py-1.5">
      <dt className="text-ink-soft">{label}</dt>
      <dd className="min-w-0 break-words text-ink">{children}</dd>
    </div>
  );
}

/** One e-mail of the outbox: its envelope, delivery state and plain text. */
export function MailMessageDialog({ message, onClose }: { message: MailMessage | null; onClose: () => void }) {
  return (
    <Dialog
      open={message !== null}
      onClose={onClose}
      size="lg"
      title={message?.subject || '(no subject)'}
      footer={<Button onClick={onClose}>Close</Button>}
    >
      {message ? (
        <div className="space-y-4 text-sm">
          <dl className="divide-y divide-line border-y border-line">
            <Row label="To">{message.to.join(', ')}</Row>
            <Row label="Status">
              <MailStatusBadge status={message.status} />
            </Row>
            <Row label="Created">{formatDateTime(message.createdAt)}</Row>
            <Row label="Sent">{formatDateTime(message.sentAt)}</Row>
            <Row label="Attempts">{formatCount(message.attempts)}</Row>
            {message.lastError ? <Row label="Last error">{message.lastError}</Row> : null}
          </dl>
          <div className="prewrap rounded-md border border-line bg-paper p-4 font-mono text-[13px] leading-relaxed" aria-label="Message text" role="document">
            <LinkedText text={message.text} />
          </div>
        </div>
      ) : null}
    </Dialog>
  );
}
