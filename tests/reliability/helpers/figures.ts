import { appendFileSync, mkdirSync } from 'node:fs';
import { join } from 'node:path';

/**
 * The figures a reliability run measured (inputs tried, faults survived, load held), printed and
 * appended as JSON lines to tests/artifacts/reliability-figures.jsonl, for the README's
 * "Reliability" section and the run's report.
 */
const artifacts = join(import.meta.dirname, '..', '..', 'artifacts');

export function record(name: string, figures: Record<string, unknown>): void {
  const line = { name, at: new Date().toISOString(), ...figures };
  console.log(`[reliability] ${name}: ${JSON.stringify(figures)}`);
  try {
    mkdirSync(artifacts, { recursive: true });
    appendFileSync(join(artifacts, 'reliability-figures.jsonl'), JSON.stringify(line) + '\n');
  } catch {
    // Figures are a by-product; a read-only checkout still runs the checks.
  }
}
