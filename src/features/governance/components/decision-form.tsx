import { zodResolver } from '@hookform/resolvers/zod';
import { useState } from 'react';
import { useForm, useWatch } from 'react-hook-form';
import { z } from 'zod';
import { challengerIndexSchema, decisionInputSchema, MIN_RATIONALE_AGAINST_RECORD, voteChoiceLabels, voteChoiceSchema, type DecisionInput, type VoteChoice } from '@shared/governance';
import { type SegmentValueRef } from '@shared/mixed-strategy';
import { keptValuesText } from '@shared/mixed-strategy-words';
import { Checkbox } from '@/components/checkbox';
import { errorMessage } from '@/lib/api-client';
import { applyServerFieldErrors } from '@/lib/form-errors';
import { Button } from '@/components/button';
import { Alert } from '@/components/callout';
import { Radio, RadioGroup } from '@/components/radio-group';
import { TextAreaField } from '@/components/text-area-field';
import { TextField } from '@/components/text-field';
import { useRecordDecision } from '@/features/governance/api/record-decision';
import { ConfirmStepDialog, namesInWords } from '@/features/governance/components/confirm-step-dialog';
import { type KeepableValue, KeepChampionPicker, MixedStrategyPreview } from '@/features/governance/components/keep-champion';
import { adoptionAgainstRecord, type ChallengerOption, optionLabel } from '@/features/governance/lib/choosing';

const emptyToUndefined = (value: unknown) => (typeof value === 'string' && value.trim() === '' ? undefined : value);
/** A radio's value ("0", "1", …) as a challenger index; nothing chosen = undefined. */
const challengerField = z.preprocess((value) => (value === undefined || value === null || value === '' ? undefined : Number(value)), challengerIndexSchema.optional());

/**
 * The committee's decision: the outcome, for an adoption the segment values that keep the champion
 * (with the mixed strategy's figures computed by the server as a preview), the rationale,
 * conditions and the date it applies from. Recording it ends the workflow, after a confirmation
 * that says what happens and who is told.
 */
export function DecisionForm({
  comparisonId,
  runId,
  quorumMet,
  tally,
  majority,
  segmentValues,
  recipients,
  onDone,
  challengers = [],
  adoptVotesByChallenger = [],
  segmentValuesByChallenger = [],
}: {
  comparisonId: number;
  runId: number | null;
  quorumMet: boolean;
  tally: Record<VoteChoice, number>;
  majority: VoteChoice | null;
  segmentValues: readonly KeepableValue[];
  /** Names of the people the decision e-mail goes to (everyone on the record but the decider). */
  recipients: readonly string[];
  onDone?: (message: string) => void;
  /** With several challengers: the one to adopt is chosen here. Empty with one challenger. */
  challengers?: readonly ChallengerOption[];
  adoptVotesByChallenger?: readonly number[];
  /** With several challengers: each one's segment values, flagged where that challenger is worse (index as `challengers`). */
  segmentValuesByChallenger?: readonly (readonly KeepableValue[])[];
}) {
  const several = challengers.length > 0;
  const decide = useRecordDecision(comparisonId);
  const [kept, setKept] = useState<SegmentValueRef[]>([]);
  const [pending, setPending] = useState<DecisionInput | null>(null);
  const {
    register,
    handleSubmit,
    setError,
    control,
    formState: { errors },
  } = useForm({
    resolver: zodResolver(
      decisionInputSchema.extend({ challenger: challengerField }).superRefine((value, context) => {
        if (several && value.outcome === 'adopt' && value.challenger === undefined) context.addIssue({ code: 'custom', path: ['challenger'], message: 'Choose the challenger to adopt' });
      }),
    ),
    defaultValues: { outcome: undefined, rationale: '', conditions: undefined, effectiveDate: undefined, acknowledgeAgainstRecord: false, challenger: undefined },
  });
  const outcome = useWatch({ control, name: 'outcome' });
  const chosenValue = useWatch({ control, name: 'challenger' }) as unknown;
  const chosen = several && outcome === 'adopt' && chosenValue !== undefined && chosenValue !== '' ? Number(chosenValue) : undefined;
  // Exceptions by segment value for the challenger adopted (with several, once it is chosen), its
  // own flagged values marked.
  const exceptionsAllowed = outcome === 'adopt' && (!several || chosen !== undefined);
  const exceptions = exceptionsAllowed ? kept : [];
  const keepable = several && chosen !== undefined ? (segmentValuesByChallenger[chosen] ?? segmentValues) : segmentValues;
  // The form checks its fields first; the confirmation dialog then sends (a challenger only with adopt).
  const onSubmit = handleSubmit(({ challenger, ...values }) =>
    setPending({
      ...values,
      strategy: exceptions.length > 0 ? { keepChampion: exceptions, ...(several ? { challenger: challenger as number | undefined } : {}) } : undefined,
      ...(several && values.outcome === 'adopt' ? { challenger: challenger as number | undefined } : {}),
    }),
  );
  // mutateAsync, not mutate's callbacks: the form leaves the page once the decision is recorded.
  const confirm = async () => {
    if (!pending) return;
    try {
      await decide.mutateAsync(pending);
      setPending(null);
      onDone?.(`The decision is recorded. ${recipients.length > 0 ? `${namesInWords(recipients, '')} ${recipients.length === 1 ? 'has' : 'have'} been told by e-mail.` : ''}`.trim());
    } catch (error) {
      setPending(null);
      applyServerFieldErrors(error, setError, ['outcome', 'rationale', 'conditions', 'effectiveDate']);
    }
  };
  // Against the majority, with no majority, or without the quorum: the server asks for an explicit
  // acknowledgement and a rationale of real length; the form says so before it is sent.
  const choiceReasons = outcome === 'adopt' ? adoptionAgainstRecord(challengers, adoptVotesByChallenger, chosen) : [];
  const againstRecord = outcome !== undefined && (!quorumMet || majority !== outcome || choiceReasons.length > 0);
  const chosenName = (input: DecisionInput) => (several && input.outcome === 'adopt' && input.challenger !== undefined ? challengers[input.challenger]?.name : undefined);
  return (
    <>
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
        {several && outcome === 'adopt' ? (
          <RadioGroup legend="Which challenger to adopt" error={errors.challenger?.message}>
            {challengers.map((option) => (
              <Radio key={option.index} label={optionLabel(option, adoptVotesByChallenger[option.index] ?? 0)} value={String(option.index)} {...register('challenger')} />
            ))}
          </RadioGroup>
        ) : null}
        {exceptionsAllowed && keepable.length > 0 ? (
          <fieldset className="space-y-2 rounded-md border border-line p-3">
            <legend className="px-1 text-sm font-medium text-ink">Keep the champion in some segment values (optional)</legend>
            <p className="text-sm text-ink-soft">
              Adopt {several && chosen !== undefined ? (challengers[chosen]?.name ?? 'the challenger') : 'the challenger'} everywhere except the values ticked here, which stay on the
              champion. The figures below are computed on the holdout and stored with the decision.
            </p>
            <KeepChampionPicker values={keepable} kept={kept} onChange={setKept} />
            <MixedStrategyPreview comparisonId={comparisonId} runId={runId} kept={exceptions} challenger={several ? chosen : undefined} />
          </fieldset>
        ) : null}
        {againstRecord ? (
          <Alert tone="caution" title="This decision goes against the record">
            <p>
              {!quorumMet ? 'The quorum of votes is not met. ' : ''}
              {majority === null ? 'The votes show no majority for it.' : majority !== outcome ? `The majority voted “${voteChoiceLabels[majority]}”.` : ''}
              {choiceReasons.length > 0 ? ` ${choiceReasons.join(' ')}` : ''} Acknowledge it and give
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
      <ConfirmStepDialog
        open={pending !== null}
        title="Record the committee’s decision?"
        recipients={namesInWords(recipients, 'nobody else is on the record')}
        confirmLabel="Record the decision"
        busy={decide.isPending}
        onConfirm={() => void confirm()}
        onCancel={() => setPending(null)}
      >
        {pending ? (
          <>
            <p>
              The decision <span className="font-medium">“{voteChoiceLabels[pending.outcome]}”</span>
              {chosenName(pending) ? (
                <>
                  {' '}
                  for <span className="font-medium">{chosenName(pending)}</span>
                </>
              ) : null}
              {pending.strategy ? ` except in ${keptValuesText(pending.strategy)}, where the champion is kept,` : ''} is recorded with its rationale
              {pending.effectiveDate ? `, applying from ${pending.effectiveDate}` : ''}. The comparison becomes decided: the workflow ends and the committee pack is archived
              as it stands.
            </p>
            {againstRecord ? <p>It goes against the record (votes or quorum); your acknowledgement is stored with it.</p> : null}
          </>
        ) : null}
      </ConfirmStepDialog>
    </>
  );
}
