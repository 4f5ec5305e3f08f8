/**
 * The bad rate a book or a swap cell states: the rate with the inferred bads of the applicants
 * without an outcome when the run infers them (reject inference by parcel or column), else the
 * bad rate of the accounts with a known outcome. The swap rule, the pages, the pack, the e-mails
 * and the demo's wording all state this one.
 *
 * Two shapes carry the inferred rate: the report's swap cells hold `inferred: { badRate, … }`
 * (null or absent when the run infers nothing), the mixed strategy's books and cells hold
 * `inferredBadRate` (present, possibly null for a cell without accounts, exactly when the run
 * infers).
 */
export interface StatedBadRateCell {
  badRate: number | null;
  inferred?: { badRate: number | null } | null;
  inferredBadRate?: number | null;
}

export function statedBadRate(cell: StatedBadRateCell): number | null {
  if (cell.inferred) return cell.inferred.badRate;
  if (cell.inferredBadRate !== undefined) return cell.inferredBadRate;
  return cell.badRate;
}
