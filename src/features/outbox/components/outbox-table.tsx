import { createColumnHelper } from '@tanstack/react-table';
import { useMemo } from 'react';
import { type MailMessage } from '@shared/users';
import { formatCount, formatDateTime, isoDateTime } from '@/lib/format';
import { DataTable } from '@/components/data-table';
import { EmptyState } from '@/components/empty-state';
import { MailStatusBadge } from '@/features/outbox/components/mail-status-badge';

const column = createColumnHelper<MailMessage>();

type OutboxTableProps = {
  messages: MailMessage[];
  total: number;
  /** 0-based page shown. */
  pageIndex: number;
  pageSize: number;
  onPageChange: (pageIndex: number) => void;
  onOpen: (message: MailMessage) => void;
};

/** Recipients listed in the table; the message dialog shows them all. */
const SHOWN_RECIPIENTS = 3;

/** The outbox, newest first, one server page at a time; a subject opens the message. */
export function OutboxTable({ messages, total, pageIndex, pageSize, onPageChange, onOpen }: OutboxTableProps) {
  const columns = useMemo(
    () => [
      column.accessor('createdAt', {
        header: 'Created',
        meta: { cellClassName: 'whitespace-nowrap' },
        cell: ({ getValue }) => <time dateTime={isoDateTime(getValue())}>{formatDateTime(getValue())}</time>,
      }),
      column.accessor('to', {
        header: 'To',
        // One address a line, never broken inside; the message itself lists everyone.
        cell: ({ getValue }) => {
          const to = getValue();
          return (
            <ul className="space-y-0.5">
              {to.slice(0, SHOWN_RECIPIENTS).map((address) => (
                <li key={address} className="whitespace-nowrap">
                  {address}
                </li>
              ))}
              {to.length > SHOWN_RECIPIENTS ? <li className="text-ink-soft">and {formatCount(to.length - SHOWN_RECIPIENTS)} more</li> : null}
            </ul>
          );
        },
      }),
      column.accessor('subject', {
        header: 'Subject',
        meta: { rowHeader: true },
        cell: ({ row, getValue }) => (
          <button
            type="button"
            onClick={() => onOpen(row.original)}
            className="text-left font-medium text-court-700 underline decoration-court-200 underline-offset-2 hover:decoration-court-700 focus-visible:outline-2 focus-visible:outline-court-500"
          >
            {getValue() || '(no subject)'}
          </button>
        ),
      }),
      column.accessor('status', { header: 'Status', cell: ({ getValue }) => <MailStatusBadge status={getValue()} /> }),
      column.accessor('attempts', { header: 'Attempts', meta: { numeric: true }, cell: ({ getValue }) => formatCount(getValue()) }),
      column.accessor('lastError', {
        header: 'Last error',
        cell: ({ getValue }) => {
          const error = getValue();
          return error ? (
            <span className="line-clamp-2 max-w-xs text-bad-strong" title={error}>
              {error}
            </span>
          ) : (
            <span className="text-ink-faint">None</span>
          );
        },
      }),
    ],
    [onOpen],
  );

  return (
    <DataTable
      data={messages}
      columns={columns}
      caption="E-mails sent by Scorecourt, newest first"
      getRowId={(message) => String(message.id)}
      density="compact"
      pagination={{ pageIndex, pageSize, total, onPageChange }}
      empty={
        <EmptyState title="No e-mails yet">
          Invitations, password resets and workflow notices appear here as Scorecourt sends them.
        </EmptyState>
      }
    />
  );
}
