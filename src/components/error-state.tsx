import { type ReactNode } from 'react';
import { errorMessage } from '@/lib/api-client';
import { Button } from '@/components/button';
import { Callout } from '@/components/callout';
import { RefreshIcon } from '@/components/icons';

type ErrorStateProps = {
  title?: ReactNode;
  /** The error; its message is shown. */
  error?: unknown;
  /** Offer a "Try again" button. */
  onRetry?: () => void;
  retrying?: boolean;
  children?: ReactNode;
  className?: string;
};

/** Loading failed: what went wrong, in words, and a way to try again. */
export function ErrorState({ title = 'This could not be loaded', error, onRetry, retrying, children, className }: ErrorStateProps) {
  return (
    <Callout
      tone="error"
      live
      title={title}
      className={className}
      actions={
        onRetry ? (
          <Button size="sm" onClick={onRetry} loading={retrying} loadingText="Trying again…" icon={<RefreshIcon />}>
            Try again
          </Button>
        ) : null
      }
    >
      {error !== undefined ? <p>{errorMessage(error)}</p> : null}
      {children}
    </Callout>
  );
}
