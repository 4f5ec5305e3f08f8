import { type ComponentProps, type ReactNode } from 'react';
import { cn } from '@/lib/cn';
import { FieldError, FieldHint, FieldLabel, controlClasses, describedBy, useFieldIds } from '@/components/field';

type TextFieldProps = Omit<ComponentProps<'input'>, 'children'> & {
  label: ReactNode;
  hint?: ReactNode;
  error?: ReactNode;
  optional?: boolean;
  /** Classes for the wrapper; `inputClassName` for the input itself. */
  className?: string;
  inputClassName?: string;
};

/** A labelled text input with an optional hint and error, wired for assistive technology. */
export function TextField({ label, hint, error, optional, className, inputClassName, id, ...props }: TextFieldProps) {
  const ids = useFieldIds(id);
  return (
    <div className={cn('space-y-1.5', className)}>
      <FieldLabel htmlFor={ids.controlId} optional={optional}>
        {label}
      </FieldLabel>
      <FieldHint id={ids.hintId}>{hint}</FieldHint>
      <input
        id={ids.controlId}
        aria-invalid={error ? true : undefined}
        aria-describedby={describedBy(ids, hint, error, props['aria-describedby'])}
        className={cn(controlClasses, 'h-10', inputClassName)}
        {...props}
      />
      <FieldError id={ids.errorId}>{error}</FieldError>
    </div>
  );
}
