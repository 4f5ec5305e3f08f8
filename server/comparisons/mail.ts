import { type ChoiceInWords, choiceMailLines } from '@shared/challengers-words';
import type { ComparisonHeadline } from '@shared/comparisons';
import type { OutgoingMail } from '../mail/mailer';
import { giniLine, signature } from '../mail/templates';

/** Wording of the comparisons' own e-mails: plain text, short, saying what to do next. */


export function analysisFinishedMail(input: {
  to: string;
  name: string;
  comparison: string;
  link: string;
  outcome: { status: 'done'; headline: ComparisonHeadline } | { status: 'failed'; error: string };
  /** Several challengers: the run's verdict record's choice (nothing is added with one challenger). */
  choice?: ChoiceInWords | null;
}): OutgoingMail {
  const { outcome } = input;
  const body =
    outcome.status === 'done'
      ? [
          `The analysis of "${input.comparison}" is done.`,
          '',
          `${giniLine(outcome.headline)}.`,
          '',
          ...choiceMailLines(input.choice),
          'Read the results, and submit the comparison for review when you are ready:',
        ]
      : [`The analysis of "${input.comparison}" could not be completed:`, '', `  ${outcome.error}`, '', 'Check the mapping and settings, then run it again:'];
  return {
    to: input.to,
    subject: outcome.status === 'done' ? `Analysis done: ${input.comparison}` : `Analysis failed: ${input.comparison}`,
    text: [`Hello ${input.name},`, '', ...body, input.link, '', signature].join('\n'),
  };
}
