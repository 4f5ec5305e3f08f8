import { type ChoiceInWords, choiceMailLines } from '@shared/challengers-words';
import { voteChoiceLabels, type VoteChoice } from '@shared/governance';
import type { ComparisonHeadline } from '@shared/comparisons';
import type { OutgoingMail } from '../mail/mailer';
import { giniLine, signature } from '../mail/templates';
import { formatCount } from '@shared/format';
import type { MixedStrategyResult } from '@shared/mixed-strategy';
import { keptValuesText, mixedStrategySentences } from '@shared/mixed-strategy-words';

/**
 * Wording of the workflow e-mails, one per transition, to the people who act next: plain text,
 * short, saying what happened, what to do and where. Signed like the other Scorecourt messages.
 */

function headlineLine(headline: ComparisonHeadline | null): string[] {
  if (!headline) return [];
  return [`${giniLine(headline)} on ${formatCount(headline.rows)} accounts.`, ''];
}

/** Long texts are quoted in full up to a point; the page has the rest. */
function quote(text: string, limit = 1500): string[] {
  const cut = text.length > limit ? `${text.slice(0, limit).trimEnd()} […]` : text;
  return cut.split('\n').map((line) => `  ${line}`);
}

interface Base {
  to: string;
  name: string;
  comparison: string;
  link: string;
}

/** `choice`: several challengers, the current verdict record's choice (nothing is added with one challenger). */
export function submittedMail(input: Base & { submittedBy: string; message: string; headline: ComparisonHeadline | null; choice?: ChoiceInWords | null }): OutgoingMail {
  return {
    to: input.to,
    subject: `Ready for review: ${input.comparison}`,
    text: [
      `Hello ${input.name},`,
      '',
      `${input.submittedBy} has submitted "${input.comparison}" for validation.`,
      '',
      ...headlineLine(input.headline),
      ...choiceMailLines(input.choice),
      ...(input.message ? ['Their note:', ...quote(input.message), ''] : []),
      'Please read the evidence, write your findings, and either validate the comparison or return it to the modeler:',
      input.link,
      '',
      signature,
    ].join('\n'),
  };
}

export function validatedMail(input: Base & { reviewer: string; findings: string; quorum: number; pack: string; choice?: ChoiceInWords | null }): OutgoingMail {
  const several = (input.choice?.challengers.length ?? 0) >= 2;
  return {
    to: input.to,
    subject: `Validated, waiting for the committee: ${input.comparison}`,
    text: [
      `Hello ${input.name},`,
      '',
      `${input.reviewer} has validated "${input.comparison}". It now waits for the committee's vote and decision.`,
      '',
      'Findings:',
      ...quote(input.findings),
      '',
      input.quorum > 0
        ? `The adoption policy needs ${input.quorum} committee ${input.quorum === 1 ? 'vote' : 'votes'} before the decision can be recorded.`
        : 'The adoption policy sets no quorum of votes.',
      ...(several ? ['', ...choiceMailLines(input.choice)] : []),
      several
        ? 'Vote to adopt one of the challengers (naming it), keep the champion or defer, and record the decision here:'
        : 'Vote to adopt the challenger, keep the champion or defer, and record the decision here:',
      input.link,
      '',
      'The committee pack (PDF, with the charts; sign in if asked, then download it from the page):',
      input.pack,
      '',
      'The verdict only advises: statistical significance is not business approval, and a new model changes who is approved and declined.',
      '',
      signature,
    ].join('\n'),
  };
}

export function returnedMail(input: Base & { reviewer: string; findings: string }): OutgoingMail {
  return {
    to: input.to,
    subject: `Returned for changes: ${input.comparison}`,
    text: [
      `Hello ${input.name},`,
      '',
      `${input.reviewer} has returned "${input.comparison}" to you with these findings:`,
      '',
      ...quote(input.findings),
      '',
      'Change the holdout, mapping or settings as needed, run the analysis again, and submit it for review once more:',
      input.link,
      '',
      signature,
    ].join('\n'),
  };
}

export function decidedMail(
  input: Base & {
    decidedBy: string;
    outcome: VoteChoice;
    rationale: string;
    conditions: string | null;
    effectiveDate: string | null;
    strategy?: MixedStrategyResult | null;
    /** Several challengers: the name of the challenger adopted (absent with one challenger). */
    adopted?: string | null;
  },
): OutgoingMail {
  return {
    to: input.to,
    subject: `Decision recorded: ${input.comparison}`,
    text: [
      `Hello ${input.name},`,
      '',
      `${input.decidedBy} has recorded the committee's decision on "${input.comparison}": ${voteChoiceLabels[input.outcome].toLowerCase()}${input.adopted ? ` “${input.adopted}”` : ''}${
        input.strategy ? `, except in ${keptValuesText(input.strategy)}, where the champion is kept` : ''
      }.`,
      ...(input.effectiveDate ? [`It applies from ${input.effectiveDate}.`] : []),
      ...(input.strategy ? ['', 'The strategy adopted, on the holdout:', ...mixedStrategySentences(input.strategy).map((line) => `  ${line}`)] : []),
      '',
      'Rationale:',
      ...quote(input.rationale),
      ...(input.conditions ? ['', 'Conditions:', ...quote(input.conditions)] : []),
      '',
      'The report with the evidence, the review, the votes and the decision is here:',
      input.link,
      '',
      signature,
    ].join('\n'),
  };
}
