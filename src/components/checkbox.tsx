import { type ComponentProps, type ReactNode } from 'react';
import { cn } from '@/lib/cn';
import { FieldError, FieldHint, describedBy, useFieldIds } from '@/components/field';

type CheckboxProps = Omit<ComponentProps<'input'>, 'type'> & {
  label: ReactNode;
  hint?: ReactNode;
  error?: ReactNode;
  className?: string;
};

/** A checkbox with its label to the right, and an optional hint and error. */
export function Checkbox({ label, hint, error, className, id, ...props }: CheckboxProps) {
  const ids = useFieldIds(id);
  return (
    <div className={cn('flex items-start gap-2.5', className)}>
      <input
        type="checkbox"
        id={ids.controlId}
        aria-invalid={error ? true : undefined}
        aria-describedby={describedBy(ids, hint, error, props['aria-describedby'])}
        className="mt-0.5 size-4 shrink-0 rounded-sm border-line-strong accent-court-700 focus-visible:outline-2 focus-visible:outline-offset-2 focus-visible:outline-court-500"
        {...props}
      />
      <div className="space-y-0.5">
        <label htmlFor={ids.controlId} className="block text-sm text-ink">
          {label}
        </label>
        <FieldHint id={ids.hintId}>{hint}</FieldHint>
        <FieldError id={ids.errorId}>{error}</FieldError>
      </div>
    </div>
  );
}

type CheckboxGroupProps = {
  legend: ReactNode;
  hint?: ReactNode;
  error?: ReactNode;
  children: ReactNode;
  className?: string;
  id?: string;
};

/** A fieldset of related checkboxes (e.g. a person's roles) with one legend, hint and error. */
export function CheckboxGroup({ legend, hint, error, children, className, id }: CheckboxGroupProps) {
  const ids = useFieldIds(id);
  return (
    <fieldset
      id={ids.controlId}
      aria-describedby={describedBy(ids, hint, error)}
      aria-invalid={error ? true : undefined}
      className={cn('space-y-2', className)}
    >
      <legend className="text-sm font-medium text-ink">{legend}</legend>
      <FieldHint id={ids.hintId}>{hint}</FieldHint>
      <div className="space-y-2">{children}</div>
      <FieldError id={ids.errorId}>{error}</FieldError>
    </fieldset>
  );
}
