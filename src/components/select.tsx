import { type ComponentProps, type ReactNode } from 'react';
import { cn } from '@/lib/cn';
import { FieldError, FieldHint, FieldLabel, controlClasses, describedBy, useFieldIds } from '@/components/field';

export interface SelectOption {
  value: string;
  label: string;
  disabled?: boolean;
}

type SelectProps = ComponentProps<'select'> & {
  label: ReactNode;
  hint?: ReactNode;
  error?: ReactNode;
  optional?: boolean;
  /** The options; or pass <option> children instead. */
  options?: SelectOption[];
  className?: string;
  selectClassName?: string;
};

/** A labelled native select with an optional hint and error. */
export function Select({ label, hint, error, optional, options, className, selectClassName, id, children, ...props }: SelectProps) {
  const ids = useFieldIds(id);
  return (
    <div className={cn('space-y-1.5', className)}>
      <FieldLabel htmlFor={ids.controlId} optional={optional}>
        {label}
      </FieldLabel>
      <FieldHint id={ids.hintId}>{hint}</FieldHint>
      <select
        id={ids.controlId}
        aria-invalid={error ? true : undefined}
        aria-describedby={describedBy(ids, hint, error, props['aria-describedby'])}
        className={cn(controlClasses, 'h-10 pr-8', selectClassName)}
        {...props}
      >
        {options?.map((option) => (
          <option key={option.value} value={option.value} disabled={option.disabled}>
            {option.label}
          </option>
        ))}
        {children}
      </select>
      <FieldError id={ids.errorId}>{error}</FieldError>
    </div>
  );
}
