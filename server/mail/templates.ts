import type { ComparisonHeadline } from '@shared/comparisons';
import { roleLabels, type Role } from '@shared/roles';
import { formatGini, formatGiniDelta, formatPInWords } from '@shared/format';
import type { OutgoingMail } from './mailer';

/** The wording of Scorecourt's own e-mails: plain text, short, and saying what to do next. */

function listRoles(roles: readonly Role[]): string {
  return roles.map((role) => roleLabels[role]).join(', ');
}

/** The last lines of every Scorecourt e-mail. */
export const signature = '— Scorecourt\n\nThis message was sent automatically. Replies are not read.';

/** "Gini: champion 50.6, challenger 55.0 (difference +4.4 points, one-sided p = 4.1 × 10⁻¹⁶)": a run's headline in one line. */
export function giniLine(headline: ComparisonHeadline): string {
  return (
    `Gini: champion ${formatGini(headline.championGini)}, challenger ${formatGini(headline.challengerGini)} ` +
    `(difference ${formatGiniDelta(headline.deltaGini)} points, ${headline.pOneSided === null ? 'no DeLong test: too few goods or bads' : `one-sided ${formatPInWords(headline.pOneSided)}`})`
  );
}

export function invitationMail(input: {
  to: string;
  name: string;
  invitedBy: string;
  roles: readonly Role[];
  link: string;
  expiresAt: Date;
}): OutgoingMail {
  return {
    to: input.to,
    subject: 'You have been invited to Scorecourt',
    text: [
      `Hello ${input.name},`,
      '',
      `${input.invitedBy} has given you access to Scorecourt, where your team compares champion and challenger credit-scoring models and records its decisions.`,
      '',
      `Your roles: ${listRoles(input.roles)}.`,
      '',
      'To choose your password and sign in, open this link:',
      input.link,
      '',
      `The link works once and expires on ${input.expiresAt.toUTCString()}. If it has expired, ask ${input.invitedBy} to invite you again.`,
      'If you were not expecting this invitation, you can ignore this message.',
      '',
      signature,
    ].join('\n'),
  };
}

export function passwordResetMail(input: { to: string; name: string; link: string; expiresAt: Date }): OutgoingMail {
  return {
    to: input.to,
    subject: 'Choose a new Scorecourt password',
    text: [
      `Hello ${input.name},`,
      '',
      'Someone asked to reset the password of your Scorecourt account. To choose a new password, open this link:',
      input.link,
      '',
      `The link works once and expires on ${input.expiresAt.toUTCString()}. Choosing a new password signs you out everywhere else.`,
      'If you did not ask for this, you can ignore this message: your password stays as it is.',
      '',
      signature,
    ].join('\n'),
  };
}
