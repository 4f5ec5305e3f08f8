import { z } from 'zod';
import { type HoldoutInfo, type MappingGuess } from '@shared/comparisons';
import { type ColumnMapping, columnMappingSchema, higherIsSchema } from '@shared/report';

/**
 * The column-mapping form: its values (what the selects hold), the defaults from the reader's
 * guess or an earlier mapping, and the conversion to the shared ColumnMapping. Pure.
 */

/** The form's shape: selects hold "" for "none", so optional columns are strings here. */
export const mappingFormSchema = z
  .object({
    outcome: z.string().min(1, 'Choose the outcome column'),
    badValue: z.string().min(1, 'Choose the value that means bad'),
    champion: z.string().min(1, "Choose the champion's score column"),
    challenger: z.string().min(1, "Choose the challenger's score column"),
    higherIs: z.object({ champion: higherIsSchema, challenger: higherIsSchema }),
    id: z.string(),
    segments: z.array(z.string()),
    exposure: z.string(),
    weight: z.string(),
    /** Keep applicants without an outcome (blank, or one of the coded values). */
    keepUnknown: z.boolean(),
    /** Coded values meaning "no outcome", comma-separated as typed (e.g. "R, reject"). */
    unknownValues: z.string().max(400),
    /** Column with each unknown applicant's probability of bad ("" for none). */
    inferredBad: z.string(),
    /** Leave out rows with an empty score (counted in the report) instead of stopping. */
    dropMissing: z.boolean(),
    /** "This score is a probability of default": its calibration is computed. */
    pd: z.object({ champion: z.boolean(), challenger: z.boolean() }),
    /** Rating grade columns ("" for none): calibration by grade. */
    grades: z.object({ champion: z.string(), challenger: z.string() }),
    /** Month or vintage column ("" for none): stability by period. */
    period: z.string(),
  })
  .superRefine((value, context) => {
    const used = new Map<string, string>();
    const roles: [keyof typeof value, string][] = [
      ['outcome', 'the outcome'],
      ['champion', "the champion's score"],
      ['challenger', "the challenger's score"],
      ['id', 'the account id'],
      ['exposure', 'the exposure'],
      ['weight', 'the weight'],
      ['inferredBad', 'the inferred probability of bad'],
    ];
    for (const [field, label] of roles) {
      const column = value[field];
      if (typeof column !== 'string' || column === '') continue;
      const other = used.get(column);
      if (other) context.addIssue({ code: 'custom', path: [field], message: `"${column}" is already ${other}` });
      else used.set(column, label);
    }
    for (const model of ['champion', 'challenger'] as const) {
      if (value.pd[model] && value.higherIs[model] !== 'riskier') {
        context.addIssue({ code: 'custom', path: ['pd', model], message: 'A probability of default is higher = riskier: change the orientation or clear this box' });
      }
      const grade = value.grades[model];
      if (grade !== '' && used.has(grade)) context.addIssue({ code: 'custom', path: ['grades', model], message: `"${grade}" is already ${used.get(grade)}` });
    }
    if (value.period !== '' && used.has(value.period)) context.addIssue({ code: 'custom', path: ['period'], message: `"${value.period}" is already ${used.get(value.period)}` });
    for (const segment of value.segments) {
      const other = used.get(segment);
      if (other) context.addIssue({ code: 'custom', path: ['segments'], message: `"${segment}" is already ${other}; it cannot also be a segment` });
    }
  });

export type MappingFormValues = z.infer<typeof mappingFormSchema>;

/** Form values from an earlier mapping (resuming or re-running), else from the reader's guess. */
export function mappingFormDefaults(guess: MappingGuess, previous: ColumnMapping | null = null, dropMissing = false): MappingFormValues {
  if (previous) {
    return {
      outcome: previous.outcome,
      badValue: previous.badValue,
      champion: previous.champion,
      challenger: previous.challenger,
      higherIs: previous.higherIs,
      id: previous.id ?? '',
      segments: previous.segments ?? [],
      exposure: previous.exposure ?? '',
      weight: previous.weight ?? '',
      keepUnknown: previous.keepUnknown ?? false,
      unknownValues: (previous.unknownValues ?? []).join(', '),
      inferredBad: previous.inferredBad ?? '',
      dropMissing,
      pd: { champion: previous.probabilityOfDefault?.champion ?? false, challenger: previous.probabilityOfDefault?.challenger ?? false },
      grades: { champion: previous.grades?.champion ?? '', challenger: previous.grades?.challenger ?? '' },
      period: previous.period ?? '',
    };
  }
  return {
    outcome: guess.outcome ?? '',
    badValue: guess.badValue ?? '',
    champion: guess.champion ?? '',
    challenger: guess.challenger ?? '',
    higherIs: { champion: guess.higherIs.champion ?? 'safer', challenger: guess.higherIs.challenger ?? 'safer' },
    id: guess.id ?? '',
    segments: guess.segments,
    exposure: guess.exposure ?? '',
    weight: '',
    keepUnknown: false,
    unknownValues: '',
    inferredBad: '',
    dropMissing,
    pd: { champion: false, challenger: false },
    grades: { champion: '', challenger: '' },
    period: '',
  };
}

/** "R, reject ,-1" → ["R", "reject", "-1"]: the coded values meaning no outcome. */
export function parseUnknownValues(text: string): string[] {
  return [...new Set(text.split(',').map((value) => value.trim()).filter((value) => value.length > 0))];
}

/** The shared ColumnMapping the API takes (checked against the shared schema). */
export function toColumnMapping(values: MappingFormValues): ColumnMapping {
  return columnMappingSchema.parse({
    outcome: values.outcome,
    badValue: values.badValue,
    champion: values.champion,
    challenger: values.challenger,
    higherIs: values.higherIs,
    id: values.id || null,
    segments: values.segments,
    exposure: values.exposure || null,
    weight: values.weight || null,
    ...(values.keepUnknown
      ? { keepUnknown: true, unknownValues: parseUnknownValues(values.unknownValues), inferredBad: values.inferredBad || null }
      : {}),
    ...(values.pd.champion || values.pd.challenger ? { probabilityOfDefault: { champion: values.pd.champion, challenger: values.pd.challenger } } : {}),
    ...(values.grades.champion || values.grades.challenger ? { grades: { champion: values.grades.champion || null, challenger: values.grades.challenger || null } } : {}),
    ...(values.period ? { period: values.period } : {}),
  });
}

/** The distinct values of a column in the preview rows (plus the guessed bad value), sorted. */
export function outcomeValues(holdout: Pick<HoldoutInfo, 'columns' | 'preview'>, column: string, extra: (string | null)[] = []): string[] {
  const index = holdout.columns.findIndex((candidate) => candidate.name === column);
  const values = new Set<string>();
  if (index >= 0) for (const row of holdout.preview) if (row[index] !== undefined && row[index].trim() !== '') values.add(row[index].trim());
  for (const value of extra) if (value) values.add(value);
  return [...values].sort((a, b) => a.localeCompare(b, 'en', { numeric: true }));
}

const kindWords = { numeric: 'numbers', categorical: 'categories', text: 'text' } as const;

/** Label of a column in a select: its name and what its values look like. */
export function columnOptionLabel(column: HoldoutInfo['columns'][number]): string {
  return `${column.name} (${kindWords[column.kind]})`;
}
