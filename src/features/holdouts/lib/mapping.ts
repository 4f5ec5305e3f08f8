import { z } from 'zod';
import { type HoldoutInfo, type MappingGuess } from '@shared/comparisons';
import { type ColumnMapping, columnMappingSchema, higherIsSchema, MAX_CHALLENGERS, mappingModelProblems } from '@shared/report';

/**
 * The column-mapping form: its values (what the selects hold), the defaults from the reader's
 * guess or an earlier mapping, and the conversion to the shared ColumnMapping. Pure.
 */

/** A model's name as typed: "" for none (the column name is used), else one line of at most 80 characters. */
const modelNameField = z.string().max(80, 'A model name has at most 80 characters').regex(/^[^\r\n]*$/, 'A model name is one line');

/** The form's shape: selects hold "" for "none", so optional columns are strings here. */
export const mappingFormSchema = z
  .object({
    outcome: z.string().min(1, 'Choose the outcome column'),
    badValue: z.string().min(1, 'Choose the value that means bad'),
    champion: z.string().min(1, "Choose the champion's score column"),
    challenger: z.string().min(1, "Choose the challenger's score column"),
    higherIs: z.object({ champion: higherIsSchema, challenger: higherIsSchema }),
    /** The modeler's names for the champion and the primary challenger ("" = the column name). */
    championName: modelNameField,
    challengerName: modelNameField,
    /** Challengers after the primary (0 to MAX_CHALLENGERS − 1), each with its score column, orientation and name. */
    moreChallengers: z
      .array(z.object({ column: z.string().min(1, "Choose this challenger's score column"), higherIs: higherIsSchema, name: modelNameField }))
      .max(MAX_CHALLENGERS - 1, `At most ${MAX_CHALLENGERS} challengers in all`),
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
    value.moreChallengers.forEach((extra, index) => {
      const other = extra.column === '' ? undefined : used.get(extra.column);
      // Another model's score is said in the shared words below; the other roles here.
      if (other && other !== "the champion's score" && other !== "the challenger's score") {
        context.addIssue({ code: 'custom', path: ['moreChallengers', index, 'column'], message: `"${extra.column}" is already ${other}` });
      }
      if (extra.column !== '' && !other) used.set(extra.column, `challenger ${index + 2}'s score`);
    });
    for (const problem of modelProblemsByField(value)) context.addIssue({ code: 'custom', path: problem.path, message: problem.message });
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

type ModelFields = Pick<MappingFormValues, 'outcome' | 'badValue' | 'champion' | 'challenger' | 'higherIs' | 'championName' | 'challengerName' | 'moreChallengers'>;

/** The models of the form as the shared mapping names them (names left empty are absent). */
function modelsMapping(values: ModelFields, extras = values.moreChallengers): ColumnMapping {
  return {
    outcome: values.outcome,
    badValue: values.badValue,
    champion: values.champion,
    challenger: values.challenger,
    higherIs: values.higherIs,
    ...(values.championName.trim() ? { championName: values.championName.trim() } : {}),
    ...(values.challengerName.trim() ? { challengerName: values.challengerName.trim() } : {}),
    ...(extras.length > 0
      ? { moreChallengers: extras.map((extra) => ({ column: extra.column, higherIs: extra.higherIs, ...(extra.name.trim() ? { name: extra.name.trim() } : {}) })) }
      : {}),
  };
}

const sentence = (text: string) => `${text.charAt(0).toUpperCase()}${text.slice(1)}.`;

/**
 * The shared rule on the models (mappingModelProblems: distinct score columns and names, none the
 * outcome), each problem placed at the field of the model that brings it: the problems of the
 * mapping up to challenger k that the mapping up to challenger k − 1 did not have belong to k.
 * The champion's and the primary's columns are also checked by the form's own rule above, so only
 * their names are placed here.
 */
export function modelProblemsByField(values: ModelFields): { path: (string | number)[]; message: string }[] {
  const placed: { path: (string | number)[]; message: string }[] = [];
  const seen = new Set<string>();
  for (let count = 0; count <= values.moreChallengers.length; count += 1) {
    const extras = values.moreChallengers.slice(0, count);
    if (extras.some((extra) => extra.column === '') || values.champion === '' || values.challenger === '') continue;
    for (const problem of mappingModelProblems(modelsMapping(values, extras))) {
      if (seen.has(problem)) continue;
      seen.add(problem);
      const aboutName = problem.startsWith('the name');
      if (count === 0) {
        if (aboutName) placed.push({ path: ['challengerName'], message: sentence(problem) });
      } else {
        placed.push({ path: ['moreChallengers', count - 1, aboutName ? 'name' : 'column'], message: sentence(problem) });
      }
    }
  }
  return placed;
}

/** Form values from an earlier mapping (resuming or re-running), else from the reader's guess. */
export function mappingFormDefaults(guess: MappingGuess, previous: ColumnMapping | null = null, dropMissing = false): MappingFormValues {
  if (previous) {
    return {
      outcome: previous.outcome,
      badValue: previous.badValue,
      champion: previous.champion,
      challenger: previous.challenger,
      higherIs: previous.higherIs,
      championName: previous.championName ?? '',
      challengerName: previous.challengerName ?? '',
      moreChallengers: (previous.moreChallengers ?? []).map((extra) => ({ column: extra.column, higherIs: extra.higherIs, name: extra.name ?? '' })),
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
    championName: '',
    challengerName: '',
    moreChallengers: [],
    id: guess.id ?? '',
    segments: guess.segments,
    exposure: guess.exposure ?? '',
    weight: '',
    // A through-the-door sample's coded "no outcome" values, when the reader saw them.
    keepUnknown: (guess.unknownValues ?? []).length > 0,
    unknownValues: (guess.unknownValues ?? []).join(', '),
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
    ...modelsMapping(values),
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
