import { type ComponentProps, type ReactNode } from 'react';
import { cn } from '@/lib/cn';
import { FieldError, FieldHint, FieldLabel, controlClasses, describedBy, useFieldIds } from '@/components/field';

type TextAreaFieldProps = Omit<ComponentProps<'textarea'>, 'children'> & {
  label: ReactNode;
  hint?: ReactNode;
  error?: ReactNode;
  optional?: boolean;
  className?: string;
  textareaClassName?: string;
};

/** A labelled multi-line text box with an optional hint and error (react-hook-form's register passes its ref through). */
export function TextAreaField({ label, hint, error, optional, className, textareaClassName, id, rows = 4, ...props }: TextAreaFieldProps) {
  const ids = useFieldIds(id);
  return (
    <div className={cn('space-y-1.5', className)}>
      <FieldLabel htmlFor={ids.controlId} optional={optional}>
        {label}
      </FieldLabel>
      <FieldHint id={ids.hintId}>{hint}</FieldHint>
      <textarea
        id={ids.controlId}
        rows={rows}
        aria-invalid={error ? true : undefined}
        aria-describedby={describedBy(ids, hint, error, props['aria-describedby'])}
        className={cn(controlClasses, 'py-2', textareaClassName)}
        {...props}
      />
      <FieldError id={ids.errorId}>{error}</FieldError>
    </div>
  );
}
