import { type ReactNode, useId } from 'react';
import { ErrorIcon } from '@/components/icons';

/** Ids that tie a control to its label, hint and error (label-for, aria-describedby). */
export function useFieldIds(id?: string) {
  const generated = useId();
  const base = id ?? `field-${generated.replace(/[^a-zA-Z0-9_-]/g, '')}`;
  return { controlId: base, hintId: `${base}-hint`, errorId: `${base}-error` };
}

export function describedBy(ids: { hintId: string; errorId: string }, hint: ReactNode, error: ReactNode, extra?: string) {
  const list = [extra, hint ? ids.hintId : null, error ? ids.errorId : null].filter(Boolean);
  return list.length > 0 ? list.join(' ') : undefined;
}

export function FieldLabel({ htmlFor, children, optional }: { htmlFor: string; children: ReactNode; optional?: boolean }) {
  return (
    <label htmlFor={htmlFor} className="block text-sm font-medium text-ink">
      {children}
      {optional ? <span className="font-normal text-ink-soft"> (optional)</span> : null}
    </label>
  );
}

export function FieldHint({ id, children }: { id: string; children: ReactNode }) {
  return children ? (
    <p id={id} className="text-sm text-ink-soft">
      {children}
    </p>
  ) : null;
}

/** The error under a field, with an icon and words (never a red border alone). */
export function FieldError({ id, children }: { id: string; children: ReactNode }) {
  return children ? (
    <p id={id} className="flex items-start gap-1.5 text-sm font-medium text-bad">
      <ErrorIcon className="mt-0.5 size-4 shrink-0" />
      <span>{children}</span>
    </p>
  ) : null;
}

export const controlClasses =
  'block w-full rounded-md border border-line-strong bg-paper-raised px-3 text-sm text-ink shadow-xs ' +
  'placeholder:text-ink-faint focus:border-court-500 focus:outline-2 focus:outline-offset-0 focus:outline-court-300 ' +
  'disabled:bg-paper-sunk disabled:text-ink-soft aria-invalid:border-bad aria-invalid:focus:outline-bad-soft';
