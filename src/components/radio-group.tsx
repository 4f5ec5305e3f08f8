import { type ComponentProps, type ReactNode } from 'react';
import { cn } from '@/lib/cn';
import { FieldError, FieldHint, describedBy, useFieldIds } from '@/components/field';

type RadioGroupProps = {
  legend: ReactNode;
  hint?: ReactNode;
  error?: ReactNode;
  children: ReactNode;
  /** Lay the options out in a row (short labels) or a column. */
  inline?: boolean;
  className?: string;
  id?: string;
};

/** A fieldset of radio buttons with one legend, hint and error. */
export function RadioGroup({ legend, hint, error, children, inline = false, className, id }: RadioGroupProps) {
  const ids = useFieldIds(id);
  return (
    <fieldset id={ids.controlId} aria-describedby={describedBy(ids, hint, error)} aria-invalid={error ? true : undefined} className={cn('space-y-1.5', className)}>
      <legend className="text-sm font-medium text-ink">{legend}</legend>
      <FieldHint id={ids.hintId}>{hint}</FieldHint>
      <div className={inline ? 'flex flex-wrap gap-x-5 gap-y-2 pt-0.5' : 'space-y-2 pt-0.5'}>{children}</div>
      <FieldError id={ids.errorId}>{error}</FieldError>
    </fieldset>
  );
}

type RadioProps = Omit<ComponentProps<'input'>, 'type'> & { label: ReactNode; hint?: ReactNode };

/** One radio button with its label to the right (react-hook-form's register passes its ref through). */
export function Radio({ label, hint, className, id, ...props }: RadioProps) {
  const ids = useFieldIds(id);
  return (
    <div className={cn('flex items-start gap-2', className)}>
      <input
        type="radio"
        id={ids.controlId}
        aria-describedby={hint ? ids.hintId : undefined}
        className="mt-0.5 size-4 shrink-0 accent-court-700 focus-visible:outline-2 focus-visible:outline-offset-2 focus-visible:outline-court-500"
        {...props}
      />
      <div className="space-y-0.5">
        <label htmlFor={ids.controlId} className="block text-sm text-ink">
          {label}
        </label>
        <FieldHint id={ids.hintId}>{hint}</FieldHint>
      </div>
    </div>
  );
}
