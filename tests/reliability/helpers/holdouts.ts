import { readFileSync } from 'node:fs';
import { join } from 'node:path';
import fc from 'fast-check';
import { sampleDir, sampleMapping } from '../../api/helpers/holdouts';

/**
 * Holdout files for the bad-input suites: valid ones cut from the demo's 2,000-row sample
 * (sample-data/README.md), and fast-check mutations of them — cut rows, swapped columns, odd
 * encodings (UTF-16, Latin-1, NUL bytes), huge fields, wide headers, quotes left open, mixed line
 * ends, BOMs in odd places, random byte changes — plus plain random bytes.
 */

/** The sample folder and the sample's mapping (points, higher = safer, bad_12m = 1 is bad), as in the API tests. */
export { sampleDir, sampleMapping };

const sampleLines = readFileSync(join(sampleDir, 'tallowmere-holdout-2025-sample-2k.csv'), 'utf8').trimEnd().split('\n');
const sampleHeader = sampleLines[0];

/** The header and `rows` data rows of the sample from `start` on (LF line ends, final newline). */
export function validHoldout(rows: number, start = 0): string {
  const from = 1 + (start % Math.max(1, sampleLines.length - 1 - rows));
  return [sampleHeader, ...sampleLines.slice(from, from + rows)].join('\n') + '\n';
}

/** A valid holdout as text: 120 to 400 rows of the sample (7% bads, so both classes are there). */
const validHoldoutArb = fc.record({ rows: fc.integer({ min: 120, max: 400 }), start: fc.nat({ max: 1500 }) }).map(({ rows, start }) => validHoldout(rows, start));

/** One change to a file. Text-level changes come first; encodings are applied last (see applyMutations). */
export type Mutation =
  | { kind: 'cut-bytes'; at: number }
  | { kind: 'drop-lines'; at: number; count: number }
  | { kind: 'duplicate-line'; at: number }
  | { kind: 'swap-header-columns'; a: number; b: number }
  | { kind: 'swap-row-columns'; line: number; a: number; b: number }
  | { kind: 'set-cell'; line: number; column: number; value: string }
  | { kind: 'huge-field'; line: number; column: number; length: number; quoted: boolean }
  | { kind: 'wide-header'; extra: number }
  | { kind: 'open-quote'; at: number }
  | { kind: 'line-ends'; pattern: ('\n' | '\r\n' | '\r')[] }
  | { kind: 'bom'; at: number }
  | { kind: 'delimiter'; to: ';' | '\t' | '|'; lines: 'all' | 'header' | 'some' }
  | { kind: 'insert-text'; at: number; text: string }
  | { kind: 'nul'; at: number }
  | { kind: 'flip-byte'; at: number; value: number }
  | { kind: 'encoding'; to: 'utf16le' | 'utf16be' | 'utf16le-bom' | 'utf16be-bom' | 'latin1' | 'utf8-bom' | 'double-bom' };

/** Cells a person or a system might leave in a holdout. */
const oddCell = fc.oneof(
  fc.constantFrom('', ' ', 'NA', 'n/a', 'null', '-', '.', '#N/A', 'abc', '1e999', '-1e999', 'Infinity', 'NaN', '0x1f', ' 0x1f', '1,5', '1.2.3', '2', 'bad', '"', '""', '="1"', '<script>alert(1)</script>', 'é', '\u00a0', '\ufeff1', '١٢٣', '9007199254740993', '-0', '+5', ' 600 ', '1e-320', '5e-324'),
  fc.string({ maxLength: 12 }),
  fc.double().map(String),
  fc.integer().map(String),
);

const lineEnd = fc.constantFrom('\n' as const, '\r\n' as const, '\r' as const);

/** Positions are fractions of the file (0–1), so a mutation fits any file length. */
const fraction = fc.double({ min: 0, max: 1, noNaN: true });
const scaled = (f: number, length: number) => Math.min(length, Math.max(0, Math.floor(f * length)));

const mutationArb: fc.Arbitrary<Mutation> = fc.oneof(
  fc.record({ kind: fc.constant('cut-bytes' as const), at: fc.nat({ max: 1_000_000 }) }),
  fc.record({ kind: fc.constant('drop-lines' as const), at: fc.nat({ max: 1_000 }), count: fc.integer({ min: 1, max: 500 }) }),
  fc.record({ kind: fc.constant('duplicate-line' as const), at: fc.nat({ max: 1_000 }) }),
  fc.record({ kind: fc.constant('swap-header-columns' as const), a: fc.nat({ max: 9 }), b: fc.nat({ max: 9 }) }),
  fc.record({ kind: fc.constant('swap-row-columns' as const), line: fc.nat({ max: 1_000 }), a: fc.nat({ max: 9 }), b: fc.nat({ max: 9 }) }),
  fc.record({ kind: fc.constant('set-cell' as const), line: fc.nat({ max: 1_000 }), column: fc.nat({ max: 9 }), value: oddCell }),
  fc.record({
    kind: fc.constant('huge-field' as const),
    line: fc.nat({ max: 1_000 }),
    column: fc.nat({ max: 9 }),
    length: fc.oneof(fc.integer({ min: 1_000, max: 300_000 }), fc.constant(9 * 1024 * 1024)),
    quoted: fc.boolean(),
  }),
  fc.record({ kind: fc.constant('wide-header' as const), extra: fc.oneof(fc.integer({ min: 1, max: 200 }), fc.integer({ min: 4_990, max: 6_000 })) }),
  fc.record({ kind: fc.constant('open-quote' as const), at: fraction.map((f) => Math.round(f * 1e6)) }),
  fc.record({ kind: fc.constant('line-ends' as const), pattern: fc.array(lineEnd, { minLength: 1, maxLength: 5 }) }),
  fc.record({ kind: fc.constant('bom' as const), at: fc.nat({ max: 1_000_000 }) }),
  fc.record({ kind: fc.constant('delimiter' as const), to: fc.constantFrom(';' as const, '\t' as const, '|' as const), lines: fc.constantFrom('all' as const, 'header' as const, 'some' as const) }),
  fc.record({ kind: fc.constant('insert-text' as const), at: fc.nat({ max: 1_000_000 }), text: fc.oneof(fc.string({ maxLength: 20 }), fc.constantFrom('"', '""', '\n', '\r', ',,,', '\n\n\n', '"a\nb"', '\u2028', '\ud800')) }),
  fc.record({ kind: fc.constant('nul' as const), at: fc.nat({ max: 1_000_000 }) }),
  fc.record({ kind: fc.constant('flip-byte' as const), at: fc.nat({ max: 1_000_000 }), value: fc.integer({ min: 0, max: 255 }) }),
  fc.record({ kind: fc.constant('encoding' as const), to: fc.constantFrom('utf16le' as const, 'utf16be' as const, 'utf16le-bom' as const, 'utf16be-bom' as const, 'latin1' as const, 'utf8-bom' as const, 'double-bom' as const) }),
);

const splitLines = (text: string) => text.split(/\r\n|\r|\n/);

function mutateText(text: string, m: Mutation): string {
  const lines = () => text.split('\n');
  switch (m.kind) {
    case 'drop-lines': {
      const all = lines();
      all.splice(1 + (m.at % Math.max(1, all.length - 1)), m.count);
      return all.join('\n');
    }
    case 'duplicate-line': {
      const all = lines();
      const at = m.at % all.length;
      all.splice(at, 0, all[at]);
      return all.join('\n');
    }
    case 'swap-header-columns':
    case 'swap-row-columns': {
      const all = lines();
      const at = m.kind === 'swap-header-columns' ? 0 : 1 + (m.line % Math.max(1, all.length - 1));
      const cells = (all[at] ?? '').split(',');
      const a = m.a % cells.length;
      const b = m.b % cells.length;
      [cells[a], cells[b]] = [cells[b], cells[a]];
      all[at] = cells.join(',');
      return all.join('\n');
    }
    case 'set-cell':
    case 'huge-field': {
      const all = lines();
      const at = 1 + (m.line % Math.max(1, all.length - 1));
      const cells = (all[at] ?? '').split(',');
      const column = m.column % cells.length;
      cells[column] = m.kind === 'set-cell' ? m.value : m.quoted ? `"${'x'.repeat(m.length)}"` : '9'.repeat(m.length);
      all[at] = cells.join(',');
      return all.join('\n');
    }
    case 'wide-header': {
      const all = lines();
      all[0] += Array.from({ length: m.extra }, (_, i) => `,extra_${i}`).join('');
      return all.join('\n');
    }
    case 'open-quote':
    case 'insert-text':
    case 'bom': {
      const insert = m.kind === 'open-quote' ? '"' : m.kind === 'bom' ? '\ufeff' : m.text;
      const at = scaled(m.at / 1e6, text.length);
      return text.slice(0, at) + insert + text.slice(at);
    }
    case 'line-ends': {
      const all = splitLines(text);
      return all.map((line, i) => (i === all.length - 1 ? line : line + m.pattern[i % m.pattern.length])).join('');
    }
    case 'delimiter': {
      const all = lines();
      return all.map((line, i) => (m.lines === 'all' || (m.lines === 'header' && i === 0) || (m.lines === 'some' && i % 7 === 3) ? line.replaceAll(',', m.to) : line)).join('\n');
    }
    default:
      return text;
  }
}

function encode(text: string, to: Extract<Mutation, { kind: 'encoding' }>['to']): Buffer {
  switch (to) {
    case 'utf16le':
      return Buffer.from(text, 'utf16le');
    case 'utf16le-bom':
      return Buffer.concat([Buffer.from([0xff, 0xfe]), Buffer.from(text, 'utf16le')]);
    case 'utf16be':
    case 'utf16be-bom': {
      const be = Buffer.from(text, 'utf16le').swap16();
      return to === 'utf16be' ? be : Buffer.concat([Buffer.from([0xfe, 0xff]), be]);
    }
    case 'latin1':
      // Non-ASCII letters in the data, so the encoding matters.
      return Buffer.from(text.replace(/credit-card/g, 'carte-crédit').replace(/branch/g, 'agència'), 'latin1');
    case 'utf8-bom':
      return Buffer.from('\ufeff' + text, 'utf8');
    case 'double-bom':
      return Buffer.from('\ufeff\ufeff' + text, 'utf8');
  }
}

/** Applies the mutations: text-level ones in order, then the last encoding (if any), then byte-level ones. */
function applyMutations(text: string, mutations: Mutation[]): Buffer {
  let current = text;
  for (const m of mutations) current = mutateText(current, m);
  const encoding = mutations.filter((m): m is Extract<Mutation, { kind: 'encoding' }> => m.kind === 'encoding').pop();
  let bytes = encoding ? encode(current, encoding.to) : Buffer.from(current, 'utf8');
  for (const m of mutations) {
    if (m.kind === 'cut-bytes') bytes = bytes.subarray(0, scaled(m.at / 1e6, bytes.length));
    else if (m.kind === 'nul' || m.kind === 'flip-byte') {
      if (bytes.length === 0) continue;
      const copy = Buffer.from(bytes);
      copy[scaled(m.at / 1e6, bytes.length - 1)] = m.kind === 'nul' ? 0 : m.value;
      bytes = copy;
    }
  }
  return bytes;
}

/** A mutated holdout: a valid one with one to four changes. */
const mutatedHoldoutArb = fc
  .tuple(validHoldoutArb, fc.array(mutationArb, { minLength: 1, maxLength: 4 }))
  .map(([text, mutations]) => ({ bytes: applyMutations(text, mutations), mutations }));

/** Anything: random bytes, random text, or a mutated holdout. */
export const anyInputArb: fc.Arbitrary<{ bytes: Buffer; mutations: Mutation[] | string }> = fc.oneof(
  { weight: 1, arbitrary: fc.uint8Array({ maxLength: 8192 }).map((array) => ({ bytes: Buffer.from(array), mutations: 'random bytes' })) },
  { weight: 1, arbitrary: fc.string({ unit: 'binary', maxLength: 4096 }).map((text) => ({ bytes: Buffer.from(text, 'utf8'), mutations: 'random text' })) },
  {
    weight: 1,
    arbitrary: fc
      .array(fc.array(oddCell, { minLength: 1, maxLength: 8 }), { minLength: 1, maxLength: 40 })
      .map((rows) => ({ bytes: Buffer.from(rows.map((row) => row.join(',')).join('\n'), 'utf8'), mutations: 'random cells' })),
  },
  { weight: 6, arbitrary: mutatedHoldoutArb },
);

/** A short description of a case for failure messages. */
export function describeCase(input: { bytes: Buffer; mutations: Mutation[] | string }): string {
  const what = typeof input.mutations === 'string' ? input.mutations : input.mutations.map((m) => JSON.stringify(m).slice(0, 120)).join(' then ');
  return `${input.bytes.length} bytes (${what})`;
}

/** Lines of a file as the reader counts them (any line end), at least 1. */
export function lineCount(bytes: Buffer): number {
  return splitLines(bytes.toString('latin1')).length;
}
