import { zodResolver } from '@hookform/resolvers/zod';
import { useForm } from 'react-hook-form';
import { type Governance, voteChoiceLabels, voteChoiceSchema, voteInputSchema } from '@shared/governance';
import { errorMessage } from '@/lib/api-client';
import { formatDateTime, isoDateTime } from '@/lib/format';
import { Button } from '@/components/button';
import { Alert } from '@/components/callout';
import { Radio, RadioGroup } from '@/components/radio-group';
import { TextField } from '@/components/text-field';
import { useCastVote } from '@/features/governance/api/cast-vote';
import { quorumText, tally } from '@/features/governance/lib/workflow';

/** The tally of the current round against the policy's quorum, and each member's vote. */
export function VotesTally({ votes, quorum }: { votes: Governance['votes']; quorum: number }) {
  const counts = tally(votes);
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
      {votes.length > 0 ? (
        <ul className="divide-y divide-line rounded-md border border-line bg-paper-raised text-sm">
          {votes.map((vote) => (
            <li key={vote.id} className="px-3 py-2" data-testid="vote">
              <span className="font-medium text-ink">{vote.voter.name}</span>: {voteChoiceLabels[vote.vote].toLowerCase()}
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
export function VoteForm({ comparisonId, current }: { comparisonId: number; current: Governance['votes'][number] | null }) {
  const cast = useCastVote(comparisonId);
  const {
    register,
    handleSubmit,
    formState: { errors },
  } = useForm({
    resolver: zodResolver(voteInputSchema),
    defaultValues: { vote: current?.vote, comment: current?.comment ?? '' },
  });
  const onSubmit = handleSubmit((values) => cast.mutate(values));
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
      <TextField label="Comment" optional error={errors.comment?.message} autoComplete="off" {...register('comment')} />
      <Button type="submit" loading={cast.isPending} loadingText="Voting…">
        {current ? 'Change my vote' : 'Cast my vote'}
      </Button>
    </form>
  );
}
