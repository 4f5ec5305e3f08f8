import { zodResolver } from '@hookform/resolvers/zod';
import { useForm, useWatch } from 'react-hook-form';
import { decisionInputSchema, MIN_RATIONALE_AGAINST_RECORD, voteChoiceLabels, voteChoiceSchema, type VoteChoice } from '@shared/governance';
import { Checkbox } from '@/components/checkbox';
import { errorMessage } from '@/lib/api-client';
import { applyServerFieldErrors } from '@/lib/form-errors';
import { Button } from '@/components/button';
import { Alert } from '@/components/callout';
import { Radio, RadioGroup } from '@/components/radio-group';
import { TextAreaField } from '@/components/text-area-field';
import { TextField } from '@/components/text-field';
import { useRecordDecision } from '@/features/governance/api/record-decision';

const emptyToUndefined = (value: unknown) => (typeof value === 'string' && value.trim() === '' ? undefined : value);

/**
 * The committee's decision: the outcome, the rationale, conditions and the date it applies from.
 * Recording it ends the workflow; the server refuses it below the policy's quorum of votes.
 */
export function DecisionForm({
  comparisonId,
  quorumMet,
  tally,
  majority,
  onDone,
}: {
  comparisonId: number;
  quorumMet: boolean;
  tally: Record<VoteChoice, number>;
  majority: VoteChoice | null;
  onDone?: (message: string) => void;
}) {
  const decide = useRecordDecision(comparisonId);
  const {
    register,
    handleSubmit,
    setError,
    control,
    formState: { errors },
  } = useForm({
    resolver: zodResolver(decisionInputSchema),
    defaultValues: { outcome: undefined, rationale: '', conditions: undefined, effectiveDate: undefined, acknowledgeAgainstRecord: false },
  });
  // mutateAsync, not mutate's callbacks: the form leaves the page once the decision is recorded.
  const onSubmit = handleSubmit(async (values) => {
    try {
      await decide.mutateAsync(values);
      onDone?.('The decision is recorded. The comparison’s creator has been told by e-mail.');
    } catch (error) {
      applyServerFieldErrors(error, setError, ['outcome', 'rationale', 'conditions', 'effectiveDate']);
    }
  });
  const outcome = useWatch({ control, name: 'outcome' });
  // Against the majority, with no majority, or without the quorum: the server asks for an explicit
  // acknowledgement and a rationale of real length; the form says so before it is sent.
  const againstRecord = outcome !== undefined && (!quorumMet || majority !== outcome);
  return (
    <form onSubmit={onSubmit} noValidate className="space-y-4" aria-label="Record the decision">
      {decide.isError ? (
        <Alert tone="error" title="The decision was not recorded">
          <p>{errorMessage(decide.error)}</p>
        </Alert>
      ) : null}
      <RadioGroup legend="Decision" error={errors.outcome ? 'Choose the decision' : undefined}>
        {voteChoiceSchema.options.map((choice) => (
          <Radio
            key={choice}
            label={`${voteChoiceLabels[choice]} — ${tally[choice]} ${tally[choice] === 1 ? 'vote' : 'votes'}${majority === choice ? ' (majority)' : ''}`}
            value={choice}
            {...register('outcome')}
          />
        ))}
      </RadioGroup>
      {againstRecord ? (
        <Alert tone="caution" title="This decision goes against the record">
          <p>
            {!quorumMet ? 'The quorum of votes is not met. ' : ''}
            {majority === null ? 'The votes show no majority for it.' : majority !== outcome ? `The majority voted “${voteChoiceLabels[majority]}”.` : ''} Acknowledge it and give
            the reason in at least {MIN_RATIONALE_AGAINST_RECORD} characters.
          </p>
          <Checkbox label="I record this decision against the votes or without the quorum, and say why in the rationale" {...register('acknowledgeAgainstRecord')} />
        </Alert>
      ) : null}
      <TextAreaField
        label="Rationale"
        hint="Why the committee decided this: the evidence it relied on and what it weighed against it."
        error={errors.rationale?.message}
        rows={5}
        {...register('rationale')}
      />
      <TextAreaField
        label="Conditions"
        optional
        hint="Monitoring, limits or follow-up the decision depends on."
        error={errors.conditions?.message}
        rows={3}
        {...register('conditions', { setValueAs: emptyToUndefined })}
      />
      <TextField
        label="Effective from"
        optional
        type="date"
        className="max-w-xs"
        error={errors.effectiveDate ? 'Give a date as YYYY-MM-DD' : undefined}
        {...register('effectiveDate', { setValueAs: emptyToUndefined })}
      />
      <Button type="submit" variant="primary" loading={decide.isPending} loadingText="Recording…" >
        Record the decision
      </Button>
      {!quorumMet ? <p className="text-sm text-ink-soft">The quorum of votes is not met: a decision now needs the acknowledgement above.</p> : null}
    </form>
  );
}
