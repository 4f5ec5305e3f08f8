import { zodResolver } from '@hookform/resolvers/zod';
import { useForm } from 'react-hook-form';
import { submitInputSchema } from '@shared/governance';
import { errorMessage } from '@/lib/api-client';
import { Button } from '@/components/button';
import { Alert } from '@/components/callout';
import { TextAreaField } from '@/components/text-area-field';
import { useSubmitComparison } from '@/features/governance/api/submit-comparison';

/** The modeler's step: send the analysed comparison to the analysts, with an optional note. */
export function SubmitForm({ comparisonId, onDone }: { comparisonId: number; onDone?: (message: string) => void }) {
  const submit = useSubmitComparison(comparisonId);
  const {
    register,
    handleSubmit,
    reset,
    formState: { errors },
  } = useForm({ resolver: zodResolver(submitInputSchema), defaultValues: { message: '' } });
  // mutateAsync, not mutate's callbacks: the form leaves the page once the state changes.
  const onSubmit = handleSubmit(async (values) => {
    try {
      await submit.mutateAsync(values);
    } catch {
      return; // shown from submit.error
    }
    reset();
    onDone?.('Submitted for review. The analysts have been told by e-mail.');
  });
  return (
    <form onSubmit={onSubmit} noValidate className="space-y-4">
      {submit.isError ? (
        <Alert tone="error" title="The comparison was not submitted">
          <p>{errorMessage(submit.error)}</p>
        </Alert>
      ) : null}
      <TextAreaField
        label="Note for the analyst"
        optional
        hint="What changed since the last review, or anything they should look at first."
        error={errors.message?.message}
        rows={3}
        {...register('message')}
      />
      <Button type="submit" variant="primary" loading={submit.isPending} loadingText="Submitting…">
        Submit for review
      </Button>
    </form>
  );
}
