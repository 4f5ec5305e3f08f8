/**
 * The client's number and date formats: the one set in shared/format.ts, which the server's
 * command line, e-mails and verdict wording use too. Pages import from here (`@/lib/format`).
 */
export * from '@shared/format';
