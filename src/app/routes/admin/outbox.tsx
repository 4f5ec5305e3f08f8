import { type QueryClient, useSuspenseQuery } from '@tanstack/react-query';
import { useCallback, useState } from 'react';
import { type LoaderFunctionArgs, useNavigate, useSearchParams } from 'react-router';
import { type MailMessage } from '@shared/users';
import { paths } from '@/config/paths';
import { Button, ButtonLink } from '@/components/button';
import { DocumentTitle } from '@/components/document-title';
import { EmptyState } from '@/components/empty-state';
import { MailIcon, RefreshIcon } from '@/components/icons';
import { PageHeader } from '@/components/page-header';
import { OUTBOX_PAGE_SIZE, outboxQueryOptions } from '@/features/outbox/api/get-outbox';
import { MailMessageDialog } from '@/features/outbox/components/mail-message-dialog';
import { OutboxTable } from '@/features/outbox/components/outbox-table';
import { requireRole } from '@/app/guards';

function pageFrom(params: URLSearchParams): number {
  const page = Number(params.get('page'));
  return Number.isInteger(page) && page >= 1 ? page : 1;
}

export const loader = (queryClient: QueryClient) => async ({ request }: LoaderFunctionArgs) => {
  await requireRole(queryClient, request, 'Outbox', 'admin');
  await queryClient.ensureQueryData(outboxQueryOptions({ page: pageFrom(new URL(request.url).searchParams), pageSize: OUTBOX_PAGE_SIZE }));
  return null;
};

export function Component() {
  const [params] = useSearchParams();
  const navigate = useNavigate();
  const page = pageFrom(params);
  // The loader filled the cache for this page; a failed load shows the route's error boundary.
  const outbox = useSuspenseQuery(outboxQueryOptions({ page, pageSize: OUTBOX_PAGE_SIZE }));
  const [reading, setReading] = useState<MailMessage | null>(null);
  const onOpen = useCallback((message: MailMessage) => setReading(message), []);
  // The open message follows the polled list, so its delivery status stays current.
  const current = reading ? (outbox.data.messages.find((message) => message.id === reading.id) ?? reading) : null;

  return (
    <>
      <DocumentTitle>Outbox</DocumentTitle>
      <PageHeader
        eyebrow="Administration"
        title="Outbox"
        subtitle="Every e-mail Scorecourt sends: invitations, password resets and workflow notices, with delivery status. Open a subject to read the message."
        actions={
          <Button onClick={() => outbox.refetch()} loading={outbox.isFetching} loadingText="Refreshing…" icon={<RefreshIcon />}>
            Refresh
          </Button>
        }
      />
      {outbox.data.messages.length === 0 && outbox.data.total > 0 ? (
        <EmptyState title="This page is past the last e-mail" action={<ButtonLink to={paths.admin.outbox()} icon={<MailIcon />}>Go to the newest e-mails</ButtonLink>} />
      ) : (
        <OutboxTable
          messages={outbox.data.messages}
          total={outbox.data.total}
          pageIndex={page - 1}
          pageSize={OUTBOX_PAGE_SIZE}
          onPageChange={(index) => navigate(paths.admin.outbox({ page: index + 1 }))}
          onOpen={onOpen}
        />
      )}
      <MailMessageDialog message={current} onClose={() => setReading(null)} />
    </>
  );
}
