import { type ReactNode } from 'react';
import { cn } from '@/lib/cn';
import { CautionIcon, CheckCircleIcon, CrossIcon, ErrorIcon, InfoIcon } from '@/components/icons';

export type CalloutTone = 'info' | 'caution' | 'error' | 'success';

const tones: Record<CalloutTone, { box: string; icon: string; Icon: (props: { className?: string }) => ReactNode; label: string }> = {
  info: { box: 'border-court-200 bg-court-50', icon: 'text-court-600', Icon: InfoIcon, label: 'Note' },
  caution: { box: 'border-caution/50 bg-caution-soft', icon: 'text-caution-strong', Icon: CautionIcon, label: 'Caution' },
  error: { box: 'border-bad/50 bg-bad-soft', icon: 'text-bad-strong', Icon: ErrorIcon, label: 'Error' },
  success: { box: 'border-good/50 bg-good-soft', icon: 'text-good-strong', Icon: CheckCircleIcon, label: 'Done' },
};

type CalloutProps = {
  tone?: CalloutTone;
  title?: ReactNode;
  children?: ReactNode;
  /** Actions under the text (a retry button, a link). */
  actions?: ReactNode;
  className?: string;
  /**
   * Announce the message when it appears (role=alert for errors and cautions, role=status for
   * information and success). Use for
   * messages that appear after an action; leave off for standing notes such as cautions.
   */
  live?: boolean;
  /** Shows a small "Dismiss" (×) button at the right. */
  onDismiss?: () => void;
};

/** A boxed note with an icon and words: information, a caution, an error or a success. */
export function Callout({ tone = 'info', title, children, actions, className, live = false, onDismiss }: CalloutProps) {
  const { box, icon, Icon, label } = tones[tone];
  const role = live ? (tone === 'error' || tone === 'caution' ? 'alert' : 'status') : undefined;
  return (
    <div role={role} className={cn('flex gap-3 rounded-md border p-3.5 text-sm text-ink print:bg-transparent', box, className)}>
      <Icon className={cn('mt-0.5 size-5 shrink-0', icon)} />
      <div className="min-w-0 flex-1 space-y-1">
        {/* The tone in words, so the icon's colour and shape are never the only signal. */}
        <p className={title ? 'font-semibold' : 'sr-only'}>{title ?? label}</p>
        {children ? <div className="space-y-1 text-ink [&_a]:font-medium [&_a]:underline">{children}</div> : null}
        {actions ? <div className="flex flex-wrap gap-2 pt-1.5">{actions}</div> : null}
      </div>
      {onDismiss ? (
        <button
          type="button"
          onClick={onDismiss}
          aria-label="Dismiss"
          className="-m-1 self-start rounded-sm p-1 text-ink-soft hover:bg-paper-raised/60 hover:text-ink focus-visible:outline-2 focus-visible:outline-court-500 print:hidden"
        >
          <CrossIcon className="size-4" />
        </button>
      ) : null}
    </div>
  );
}

/** A Callout that is announced when it appears: the result of something the person just did. */
export function Alert(props: Omit<CalloutProps, 'live'>) {
  return <Callout {...props} live />;
}
