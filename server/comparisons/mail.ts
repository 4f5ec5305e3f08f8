import type { ComparisonHeadline } from '@shared/comparisons';
import type { OutgoingMail } from '../mail/mailer';

/** Wording of the comparisons' own e-mails: plain text, short, saying what to do next. */

const signature = '— Scorecourt\n\nThis message was sent automatically. Replies are not read.';
const points = (value: number) => `${value >= 0 ? '+' : '−'}${Math.abs(value * 100).toFixed(1)}`;

export function analysisFinishedMail(input: {
  to: string;
  name: string;
  comparison: string;
  link: string;
  outcome: { status: 'done'; headline: ComparisonHeadline } | { status: 'failed'; error: string };
}): OutgoingMail {
  const { outcome } = input;
  const body =
    outcome.status === 'done'
      ? [
          `The analysis of "${input.comparison}" is done.`,
          '',
          `Gini: champion ${(outcome.headline.championGini * 100).toFixed(1)}, challenger ${(outcome.headline.challengerGini * 100).toFixed(1)} ` +
            `(difference ${points(outcome.headline.deltaGini)} points, one-sided p = ${outcome.headline.pOneSided.toPrecision(2)}).`,
          '',
          'Read the results, and submit the comparison for review when you are ready:',
        ]
      : [`The analysis of "${input.comparison}" could not be completed:`, '', `  ${outcome.error}`, '', 'Check the mapping and settings, then run it again:'];
  return {
    to: input.to,
    subject: outcome.status === 'done' ? `Analysis done: ${input.comparison}` : `Analysis failed: ${input.comparison}`,
    text: [`Hello ${input.name},`, '', ...body, input.link, '', signature].join('\n'),
  };
}
