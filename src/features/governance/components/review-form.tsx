import { zodResolver } from '@hookform/resolvers/zod';
import { useState } from 'react';
import { useForm } from 'react-hook-form';
import { reviewInputSchema, type ReviewInput } from '@shared/governance';
import { errorMessage } from '@/lib/api-client';
import { applyServerFieldErrors } from '@/lib/form-errors';
import { Button } from '@/components/button';
import { Alert } from '@/components/callout';
import { Radio, RadioGroup } from '@/components/radio-group';
import { TextAreaField } from '@/components/text-area-field';
import { useReviewComparison } from '@/features/governance/api/review-comparison';
import { ConfirmStepDialog } from '@/features/governance/components/confirm-step-dialog';

/**
 * The analyst's step: findings, and validate the comparison or return it to the modeler, after a
 * confirmation that says what happens and who is told.
 */
export function ReviewForm({ comparisonId, creator, onDone }: { comparisonId: number; creator: string; onDone?: (message: string) => void }) {
  const review = useReviewComparison(comparisonId);
  const [pending, setPending] = useState<ReviewInput | null>(null);
  const {
    register,
    handleSubmit,
    setError,
    formState: { errors },
  } = useForm({ resolver: zodResolver(reviewInputSchema), defaultValues: { outcome: undefined, findings: '' } });
  // The form checks its fields first; the confirmation dialog then sends.
  const onSubmit = handleSubmit((values) => setPending(values));
  // mutateAsync, not mutate's callbacks: the form leaves the page once the state changes.
  const confirm = async () => {
    if (!pending) return;
    try {
      const governance = await review.mutateAsync(pending);
      setPending(null);
      onDone?.(
        governance.state === 'validated' ? 'Validated. The committee members have been told by e-mail.' : `Returned to the modeler; ${creator} has been told by e-mail.`,
      );
    } catch (error) {
      setPending(null);
      applyServerFieldErrors(error, setError, ['findings', 'outcome']);
    }
  };
  const validating = pending?.outcome === 'validated';
  return (
    <>
      <form onSubmit={onSubmit} noValidate className="space-y-4">
        {review.isError ? (
          <Alert tone="error" title="The review was not recorded">
            <p>{errorMessage(review.error)}</p>
          </Alert>
        ) : null}
        <TextAreaField
          label="Findings"
          hint="What you checked and what you found: the uplift and its interval, the tests, stability across segments, data quality, open questions."
          error={errors.findings?.message}
          rows={7}
          {...register('findings')}
        />
        <RadioGroup legend="Outcome" error={errors.outcome ? 'Choose validate or return' : undefined}>
          <Radio label="Validate: the evidence holds; it goes to the committee" value="validated" {...register('outcome')} />
          <Radio label="Return to the modeler: something must change first" value="returned" {...register('outcome')} />
        </RadioGroup>
        <Button type="submit" variant="primary" loading={review.isPending} loadingText="Recording…">
          Record the review
        </Button>
      </form>
      <ConfirmStepDialog
        open={pending !== null}
        title={validating ? 'Validate this comparison?' : 'Return this comparison to the modeler?'}
        recipients={validating ? 'every active committee member who did not shape the comparison, with the link to the committee pack' : `${creator}, who created the comparison`}
        confirmLabel={validating ? 'Validate' : 'Return to the modeler'}
        busy={review.isPending}
        onConfirm={() => void confirm()}
        onCancel={() => setPending(null)}
      >
        <p>
          {validating
            ? 'Your findings are recorded and the comparison goes to the committee, which votes and decides on the analysis you reviewed.'
            : 'Your findings are recorded and the comparison goes back to the modeler: it needs a new set-up and analysis before it can be submitted again.'}
        </p>
      </ConfirmStepDialog>
    </>
  );
}
