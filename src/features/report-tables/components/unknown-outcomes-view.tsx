import { fullSwapCell, populationOf, type Report } from '@shared/report';
import { formatCount, formatPercent } from '@/lib/format';
import { Section } from '@/components/card';
import { ModelTag } from '@/components/model-tag';

/**
 * Applicants without an outcome on the data page: how many rows and applicants (weighted), by
 * each model's decision at the report's cut-offs and by segment value. Nothing for a holdout where
 * every outcome is known.
 */
export function UnknownOutcomesView({ report }: { report: Report }) {
  const population = populationOf(report);
  if (!report.population) return null;
  const swap = report.swap;
  const [bothAccept, swapIn, swapOut, bothReject] = [swap.bothAccept, swap.swapIn, swap.swapOut, swap.bothReject].map(fullSwapCell);
  const decisions = [
    { model: 'champion' as const, accepts: bothAccept.unknown + swapOut.unknown, declines: swapIn.unknown + bothReject.unknown },
    { model: 'challenger' as const, accepts: bothAccept.unknown + swapIn.unknown, declines: swapOut.unknown + bothReject.unknown },
  ];
  const segments = report.segments.filter((row) => row.unknown !== undefined);
  return (
    <Section title="Applicants without an outcome">
      <p className="mb-3 text-sm text-ink-soft">
        {formatCount(population.rows)} rows stand for {formatCount(population.accounts)} applicants; {formatCount(population.unknown.accounts)} of them (
        {formatCount(population.unknown.rows)} rows, {formatPercent(population.unknown.accounts / population.accounts)}) have no outcome. They count in
        approval rates, cut-offs and swap sets; AUC, KS, DeLong, the bootstrap and bad rates use the {formatCount(population.known.accounts)} with an
        outcome.
      </p>
      <table className="mb-4 w-full max-w-xl text-sm">
        <caption className="sr-only">Applicants without an outcome by each model&apos;s decision</caption>
        <thead>
          <tr className="text-left text-xs text-ink-soft">
            <th scope="col">Model (at the report&apos;s cut-off)</th>
            <th scope="col" className="text-right">
              Accepted, no outcome
            </th>
            <th scope="col" className="text-right">
              Declined, no outcome
            </th>
          </tr>
        </thead>
        <tbody className="num">
          {decisions.map((row) => (
            <tr key={row.model}>
              <th scope="row" className="py-1 text-left font-normal">
                <ModelTag model={row.model} />
              </th>
              <td className="text-right" data-testid={`unknown-${row.model}-accepts`}>
                {formatCount(row.accepts)}
              </td>
              <td className="text-right">{formatCount(row.declines)}</td>
            </tr>
          ))}
        </tbody>
      </table>
      {segments.length > 0 ? (
        <table className="w-full max-w-xl text-sm">
          <caption className="sr-only">Applicants without an outcome by segment value</caption>
          <thead>
            <tr className="text-left text-xs text-ink-soft">
              <th scope="col">Segment value</th>
              <th scope="col" className="text-right">
                Applicants
              </th>
              <th scope="col" className="text-right">
                No outcome
              </th>
            </tr>
          </thead>
          <tbody className="num">
            {segments.map((row) => (
              <tr key={`${row.column}=${row.value}`}>
                <th scope="row" className="py-1 text-left font-normal">
                  {row.column} = {row.value}
                </th>
                <td className="text-right">{formatCount(row.accounts ?? row.n)}</td>
                <td className="text-right">
                  {formatCount(row.unknown ?? 0)} ({formatPercent(row.accounts ? (row.unknown ?? 0) / row.accounts : 0)})
                </td>
              </tr>
            ))}
          </tbody>
        </table>
      ) : null}
    </Section>
  );
}
