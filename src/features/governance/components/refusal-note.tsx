import { InfoIcon } from '@/components/icons';

/** Why a step the person's role allows is not theirs to take here. */
export function RefusalNote({ children }: { children: string }) {
  return (
    <p className="flex items-start gap-2 rounded-md border border-line bg-paper px-3 py-2 text-sm text-ink-soft">
      <InfoIcon className="mt-0.5 size-4 shrink-0" />
      <span>{children}</span>
    </p>
  );
}
