import { zodResolver } from '@hookform/resolvers/zod';
import { useForm } from 'react-hook-form';
import { reviewInputSchema } from '@shared/governance';
import { errorMessage } from '@/lib/api-client';
import { applyServerFieldErrors } from '@/lib/form-errors';
import { Button } from '@/components/button';
import { Alert } from '@/components/callout';
import { Radio, RadioGroup } from '@/components/radio-group';
import { TextAreaField } from '@/components/text-area-field';
import { useReviewComparison } from '@/features/governance/api/review-comparison';

/** The analyst's step: findings, and validate the comparison or return it to the modeler. */
export function ReviewForm({ comparisonId, onDone }: { comparisonId: number; onDone?: (message: string) => void }) {
  const review = useReviewComparison(comparisonId);
  const {
    register,
    handleSubmit,
    setError,
    formState: { errors },
  } = useForm({ resolver: zodResolver(reviewInputSchema), defaultValues: { outcome: undefined, findings: '' } });
  // mutateAsync, not mutate's callbacks: the form leaves the page once the state changes.
  const onSubmit = handleSubmit(async (values) => {
    try {
      const governance = await review.mutateAsync(values);
      onDone?.(
        governance.state === 'validated' ? 'Validated. The committee members have been told by e-mail.' : 'Returned to the modeler, who has been told by e-mail.',
      );
    } catch (error) {
      applyServerFieldErrors(error, setError, ['findings', 'outcome']);
    }
  });
  return (
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
  );
}
