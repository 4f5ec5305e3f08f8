import { zodResolver } from '@hookform/resolvers/zod';
import { useForm, useWatch } from 'react-hook-form';
import { z } from 'zod';
import { challengerIndexSchema, type Governance, voteChoiceLabels, voteChoiceSchema, voteInputSchema } from '@shared/governance';
import { errorMessage } from '@/lib/api-client';
import { formatDateTime, isoDateTime } from '@/lib/format';
import { Button } from '@/components/button';
import { Alert } from '@/components/callout';
import { Radio, RadioGroup } from '@/components/radio-group';
import { TextField } from '@/components/text-field';
import { useCastVote } from '@/features/governance/api/cast-vote';
import { quorumText, tally } from '@/features/governance/lib/workflow';
import { type ChallengerOption, optionLabel } from '@/features/governance/lib/choosing';

/** A radio's value ("0", "1", …) as a challenger index; nothing chosen = undefined. */
const challengerField = z.preprocess((value) => (value === undefined || value === null || value === '' ? undefined : Number(value)), challengerIndexSchema.optional());

/** The tally of the current round against the policy's quorum, and each member's vote. */
export function VotesTally({
  votes,
  quorum,
  challengers = [],
  adoptVotesByChallenger = [],
}: {
  votes: Governance['votes'];
  quorum: number;
  /** With several challengers: their names, so each adopt vote says which one. */
  challengers?: readonly ChallengerOption[];
  adoptVotesByChallenger?: readonly number[];
}) {
  const counts = tally(votes);
  const named = (vote: Governance['votes'][number]) =>
    challengers.length > 0 && vote.vote === 'adopt' && vote.challenger !== null ? ` ${challengers[vote.challenger]?.name ?? `challenger ${vote.challenger + 1}`}` : '';
  return (
    <div className="space-y-3">
      <p className="text-sm text-ink" data-testid="quorum">
        {quorumText(votes.length, quorum)}.
      </p>
      <dl className="num grid grid-cols-3 gap-2 text-center">
        {voteChoiceSchema.options.map((choice) => (
          <div key={choice} className="rounded-md border border-line bg-paper px-2 py-2">
            <dt className="text-xs text-ink-soft">{voteChoiceLabels[choice]}</dt>
            <dd className="text-lg font-semibold text-ink">{counts[choice]}</dd>
          </div>
        ))}
      </dl>
      {challengers.length > 0 ? (
        <ul className="space-y-1 text-sm text-ink" data-testid="adopt-votes-by-challenger">
          {challengers.map((option) => (
            <li key={option.index}>
              Adopt {option.name}: <span className="num font-semibold">{adoptVotesByChallenger[option.index] ?? 0}</span>
            </li>
          ))}
        </ul>
      ) : null}
      {votes.length > 0 ? (
        <ul className="divide-y divide-line rounded-md border border-line bg-paper-raised text-sm">
          {votes.map((vote) => (
            <li key={vote.id} className="px-3 py-2" data-testid="vote">
              <span className="font-medium text-ink">{vote.voter.name}</span>: {voteChoiceLabels[vote.vote].toLowerCase()}
              {named(vote)}
              <span className="text-ink-soft">
                {' '}
                · <time dateTime={isoDateTime(vote.createdAt)}>{formatDateTime(vote.createdAt)}</time>
              </span>
              {vote.comment ? <p className="prewrap text-ink-soft">{vote.comment}</p> : null}
            </li>
          ))}
        </ul>
      ) : (
        <p className="text-sm text-ink-soft">No votes in this round yet.</p>
      )}
    </div>
  );
}

/** A committee member's vote; voting again replaces their earlier vote. */
export function VoteForm({
  comparisonId,
  current,
  challengers = [],
}: {
  comparisonId: number;
  current: Governance['votes'][number] | null;
  /** With several challengers: an adopt vote names one of them. Empty with one challenger. */
  challengers?: readonly ChallengerOption[];
}) {
  const cast = useCastVote(comparisonId);
  const several = challengers.length > 0;
  const schema = voteInputSchema.extend({ challenger: challengerField }).superRefine((value, context) => {
    if (several && value.vote === 'adopt' && value.challenger === undefined) context.addIssue({ code: 'custom', path: ['challenger'], message: 'Choose the challenger to adopt' });
  });
  const {
    register,
    handleSubmit,
    control,
    formState: { errors },
  } = useForm({
    resolver: zodResolver(schema),
    defaultValues: { vote: current?.vote, comment: current?.comment ?? '', challenger: current?.vote === 'adopt' && several ? String(current.challenger ?? 0) : undefined },
  });
  const vote = useWatch({ control, name: 'vote' });
  // A challenger only with adopt (the server refuses it with keep or defer).
  const onSubmit = handleSubmit(({ challenger, ...values }) => cast.mutate({ ...values, ...(several && values.vote === 'adopt' ? { challenger } : {}) }));
  return (
    <form onSubmit={onSubmit} noValidate className="space-y-4">
      {cast.isError ? (
        <Alert tone="error" title="The vote was not recorded">
          <p>{errorMessage(cast.error)}</p>
        </Alert>
      ) : null}
      {cast.isSuccess ? (
        <Alert tone="success" onDismiss={() => cast.reset()}>
          <p>Your vote is recorded.</p>
        </Alert>
      ) : null}
      <RadioGroup
        legend={current ? 'Your vote (voting again replaces it)' : 'Your vote'}
        inline
        error={errors.vote ? 'Choose one' : undefined}
      >
        {voteChoiceSchema.options.map((choice) => (
          <Radio key={choice} label={voteChoiceLabels[choice]} value={choice} {...register('vote')} />
        ))}
      </RadioGroup>
      {several && vote === 'adopt' ? (
        <RadioGroup legend="Which challenger to adopt" error={errors.challenger?.message}>
          {challengers.map((option) => (
            <Radio key={option.index} label={optionLabel(option)} value={String(option.index)} {...register('challenger')} />
          ))}
        </RadioGroup>
      ) : null}
      <TextField label="Comment" optional error={errors.comment?.message} autoComplete="off" {...register('comment')} />
      <Button type="submit" loading={cast.isPending} loadingText="Voting…">
        {current ? 'Change my vote' : 'Cast my vote'}
      </Button>
    </form>
  );
}
