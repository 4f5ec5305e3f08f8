import { zodResolver } from '@hookform/resolvers/zod';
import { useForm } from 'react-hook-form';
import { createComparisonInputSchema } from '@shared/comparisons';
import { errorMessage } from '@/lib/api-client';
import { applyServerFieldErrors } from '@/lib/form-errors';
import { Button } from '@/components/button';
import { Alert } from '@/components/callout';
import { FieldError, FieldHint, FieldLabel, controlClasses, describedBy, useFieldIds } from '@/components/field';
import { TextField } from '@/components/text-field';
import { useCreateComparison } from '@/features/comparisons/api/create-comparison';
import { nameFromFile } from '@/features/comparisons/lib/name-from-file';

const detailsSchema = createComparisonInputSchema.pick({ name: true, description: true });

/**
 * Step 2: name and describe the comparison, then store it as a draft (POST /api/comparisons
 * without a mapping) so the work survives leaving the page; the mapping comes next.
 */
export function ComparisonDetailsForm({ holdoutId, fileName, onCreated, onBack }: {
  holdoutId: number;
  fileName: string;
  onCreated: (id: number) => void;
  onBack: () => void;
}) {
  const create = useCreateComparison();
  const description = useFieldIds();
  const {
    register,
    handleSubmit,
    setError,
    formState: { errors },
  } = useForm({ resolver: zodResolver(detailsSchema), defaultValues: { name: nameFromFile(fileName), description: '' } });

  const onSubmit = handleSubmit((values) =>
    create.mutate(
      { holdoutId, name: values.name, description: values.description || undefined },
      {
        onSuccess: ({ id }) => onCreated(id),
        onError: (error) => applyServerFieldErrors(error, setError, ['name', 'description']),
      },
    ),
  );

  return (
    <form onSubmit={onSubmit} noValidate className="max-w-2xl space-y-5">
      {create.isError ? (
        <Alert tone="error" title="The comparison was not created">
          <p>{errorMessage(create.error)}</p>
        </Alert>
      ) : null}
      <TextField
        label="Name of the comparison"
        hint="What is being compared, as colleagues will look for it: e.g. “Cash-flow challenger, 2025 holdout”."
        error={errors.name?.message}
        autoComplete="off"
        {...register('name')}
      />
      <div className="space-y-1.5">
        <FieldLabel htmlFor={description.controlId} optional>
          Description
        </FieldLabel>
        <FieldHint id={description.hintId}>The models, the performance window, anything a reviewer should know.</FieldHint>
        <textarea
          id={description.controlId}
          rows={4}
          aria-invalid={errors.description ? true : undefined}
          aria-describedby={describedBy(description, true, errors.description?.message)}
          className={`${controlClasses} py-2`}
          {...register('description')}
        />
        <FieldError id={description.errorId}>{errors.description?.message}</FieldError>
      </div>
      <div className="flex flex-wrap gap-2 border-t border-line pt-4">
        <Button onClick={onBack} disabled={create.isPending}>
          Choose another file
        </Button>
        <Button type="submit" variant="primary" loading={create.isPending} loadingText="Saving the draft…">
          Save and map the columns
        </Button>
      </div>
    </form>
  );
}
