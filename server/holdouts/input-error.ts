import { errorCodes } from '@shared/errors';
import { AppError } from '../errors';
import { HoldoutInputError } from '../reader/errors';
import { StatisticError } from '../stats/statistic-error';

/**
 * The reader's and the engine's complaints about the data, as the API's 400: the message names
 * the row (the file's line number, header = 1) and the column; `details` repeats them for the
 * client, with the reader's code for the kind of problem.
 */
export function badInputError(error: HoldoutInputError | StatisticError): AppError {
  if (error instanceof HoldoutInputError) {
    return new AppError(errorCodes.badInput, error.message, 400, { row: error.row, column: error.column, problem: error.code });
  }
  return new AppError(errorCodes.badInput, error.message, 400, { row: null, column: null, problem: error.code });
}

/** Runs `work`, turning the reader's and engine's data errors into the API's 400. */
export async function asBadInput<T>(work: () => Promise<T>): Promise<T> {
  try {
    return await work();
  } catch (error) {
    if (error instanceof HoldoutInputError || error instanceof StatisticError) throw badInputError(error);
    throw error;
  }
}
