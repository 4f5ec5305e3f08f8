import { createWriteStream } from 'node:fs';
import seedrandom from 'seedrandom';

/**
 * A seeded synthetic holdout for the benchmark, written as CSV: account id, channel (segment),
 * loan amount (exposure), outcome, and both models' scores. Points scores are integers
 * (higher = safer, many ties); continuous scores are PDs with 6 significant digits
 * (higher = riskier), or with six decimals (pd6). Same seed → same bytes.
 */
export interface BenchHoldoutOptions {
  rows: number;
  seed: string;
  /** points: integers; continuous: PDs with 6 significant digits; pd6: PDs with six decimals. */
  scores: 'points' | 'continuous' | 'pd6';
}

export async function writeBenchHoldout(path: string, options: BenchHoldoutOptions): Promise<void> {
  const random = seedrandom(options.seed);
  const normal = () => Math.sqrt(-2 * Math.log(1 - random())) * Math.cos(2 * Math.PI * random());
  const out = createWriteStream(path);
  const channels = ['branch', 'web', 'broker'];
  const write = (text: string) => (out.write(text) ? Promise.resolve() : new Promise<void>((resolve) => out.once('drain', () => resolve())));
  await write('account_id,channel,loan_amount,bad,champion,challenger\n');
  let buffer = '';
  for (let i = 0; i < options.rows; i++) {
    const truth = normal();
    const a = 1.0 * truth + normal();
    const b = 1.25 * truth + 0.8 * normal();
    const bad = random() < 1 / (1 + Math.exp(-(-2.9 + 1.1 * truth))) ? 1 : 0;
    const channel = channels[Math.floor(random() * 3)];
    const amount = Math.round(1000 + random() * 24000);
    let champion: string;
    let challenger: string;
    if (options.scores === 'points') {
      champion = String(Math.round(600 - 40 * a));
      challenger = String(Math.round(600 - 40 * b));
    } else if (options.scores === 'pd6') {
      champion = (1 / (1 + Math.exp(-(a - 3)))).toFixed(6);
      challenger = (1 / (1 + Math.exp(-(b - 3)))).toFixed(6);
    } else {
      champion = (1 / (1 + Math.exp(-(a - 3)))).toPrecision(6);
      challenger = (1 / (1 + Math.exp(-(b - 3)))).toPrecision(6);
    }
    buffer += `A${i},${channel},${amount},${bad},${champion},${challenger}\n`;
    if (buffer.length > 1 << 16) {
      await write(buffer);
      buffer = '';
    }
  }
  await write(buffer);
  await new Promise<void>((resolve, reject) => out.end((error?: Error | null) => (error ? reject(error) : resolve())));
}
