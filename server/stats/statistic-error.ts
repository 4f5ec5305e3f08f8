/**
 * A statistic that cannot be computed for the data it was given (one class only, mismatched
 * lengths, …). The message is short and specific, e.g. `auc requires at least one good and one
 * bad`; the API and CLI show it as bad input.
 */
export class StatisticError extends Error {
  override name = 'StatisticError';
  constructor(
    message: string,
    readonly code: string = 'statistic_undefined',
  ) {
    super(message);
  }
}
