import { zodResolver } from '@hookform/resolvers/zod';
import { useEffect, useMemo } from 'react';
import { type DeepPartial, type FieldErrors, type UseFormRegister, useFieldArray, useForm, useWatch } from 'react-hook-form';
import { type HoldoutInfo } from '@shared/comparisons';
import { type ColumnMapping, type HigherIs, MAX_CHALLENGERS } from '@shared/report';
import { Button } from '@/components/button';
import { Callout } from '@/components/callout';
import { Checkbox, CheckboxGroup } from '@/components/checkbox';
import { ModelTag } from '@/components/model-tag';
import { Radio, RadioGroup } from '@/components/radio-group';
import { Select } from '@/components/select';
import { TextField } from '@/components/text-field';
import {
  type MappingFormValues,
  columnOptionLabel,
  mappingFormDefaults,
  mappingFormSchema,
  outcomeValues,
  toColumnMapping,
} from '@/features/holdouts/lib/mapping';

type MappingFormProps = {
  holdout: HoldoutInfo;
  /** An earlier mapping to start from (a resumed draft, a re-run); else the reader's guess. */
  initial: ColumnMapping | null;
  initialDropMissing: boolean;
  onSubmit: (mapping: ColumnMapping, dropMissing: boolean) => void;
  /** Called as the person maps columns, so the preview can label them. */
  onRolesChange?: (roles: Record<string, string>) => void;
  busy?: boolean;
};

const orientationWords: Record<HigherIs, string> = { safer: 'higher is safer', riskier: 'higher is riskier' };

/**
 * Step 3: which column is the outcome (and which value means bad), which hold the two scores and
 * which way each points, and the optional id, segments and exposure. Starts from the reader's
 * guess; the orientation hint from the data is shown beside each score.
 */
export function MappingForm({ holdout, initial, initialDropMissing, onSubmit, onRolesChange, busy }: MappingFormProps) {
  const defaults = useMemo(() => mappingFormDefaults(holdout.guess, initial, initialDropMissing), [holdout.guess, initial, initialDropMissing]);
  const {
    register,
    handleSubmit,
    control,
    setValue,
    formState: { errors },
  } = useForm<MappingFormValues>({ resolver: zodResolver(mappingFormSchema), defaultValues: defaults });
  const values = useWatch({ control });
  const extras = useFieldArray({ control, name: 'moreChallengers' });

  const columnOptions = holdout.columns.map((column) => ({ value: column.name, label: columnOptionLabel(column) }));
  const none = { value: '', label: 'None' };
  const badValues = outcomeValues(holdout, values.outcome ?? '', [holdout.guess.outcome === values.outcome ? holdout.guess.badValue : null, values.badValue ?? null]);
  const segmentCandidates = holdout.columns.filter((column) => column.kind === 'categorical');

  // A new outcome column: pick its likely bad value again.
  useEffect(() => {
    if (values.outcome && values.badValue && !badValues.includes(values.badValue)) setValue('badValue', badValues.includes('1') ? '1' : (badValues[0] ?? ''));
  }, [values.outcome, values.badValue, badValues, setValue]);

  useEffect(() => {
    if (!onRolesChange) return;
    const roles: Record<string, string> = {};
    if (values.outcome) roles[values.outcome] = 'Outcome';
    if (values.champion) roles[values.champion] = 'Champion';
    if (values.challenger) roles[values.challenger] = 'Challenger';
    (values.moreChallengers ?? []).forEach((extra, index) => {
      if (extra?.column) roles[extra.column] = `Challenger ${index + 2}`;
    });
    if (values.id) roles[values.id] = 'Account id';
    if (values.exposure) roles[values.exposure] = 'Exposure';
    if (values.weight) roles[values.weight] = 'Weight';
    if (values.keepUnknown && values.inferredBad) roles[values.inferredBad] = 'Inferred bad';
    for (const segment of values.segments ?? []) if (segment) roles[segment] = 'Segment';
    onRolesChange(roles);
  }, [values.outcome, values.champion, values.challenger, values.moreChallengers, values.id, values.exposure, values.weight, values.keepUnknown, values.inferredBad, values.segments, onRolesChange]);
  const numericOptions = columnOptions.filter((option) => holdout.columns.find((column) => column.name === option.value)?.kind === 'numeric');

  const submit = handleSubmit((form) => onSubmit(toColumnMapping(form), form.dropMissing));

  return (
    <form onSubmit={submit} noValidate className="space-y-8">
      <fieldset className="grid gap-4 md:grid-cols-2">
        <legend className="mb-2 text-base font-semibold text-ink">Outcome</legend>
        <Select label="Outcome column" hint="Whether each account went bad over the performance window." error={errors.outcome?.message} options={[{ value: '', label: 'Choose a column' }, ...columnOptions]} {...register('outcome')} />
        <Select
          label="Value that means bad"
          hint="Bad is the event; the other value in the column means good."
          error={errors.badValue?.message}
          options={[{ value: '', label: 'Choose a value' }, ...badValues.map((value) => ({ value, label: value }))]}
          {...register('badValue')}
        />
      </fieldset>

      <div className="grid gap-6 md:grid-cols-2">
        <ScoreFields model="champion" holdout={holdout} register={register} values={values} error={errors.champion?.message} columnOptions={columnOptions} pdError={errors.pd?.champion?.message} gradeError={errors.grades?.champion?.message} />
        <ScoreFields model="challenger" holdout={holdout} register={register} values={values} error={errors.challenger?.message} columnOptions={columnOptions} pdError={errors.pd?.challenger?.message} gradeError={errors.grades?.challenger?.message} nameError={errors.challengerName?.message} several={extras.fields.length > 0} />
      </div>

      <fieldset className="space-y-4" data-testid="more-challengers">
        <legend className="mb-2 text-base font-semibold text-ink">More challengers</legend>
        <p className="text-sm text-ink-soft">
          Up to {MAX_CHALLENGERS} challengers in all, each scored on the same holdout. Each is tested against the champion (with a Holm adjustment across them), all
          together in a joint test, and against each other; the verdict recommends at most one. Probability-of-default calibration and grades are computed for the
          champion and the first challenger.
        </p>
        {extras.fields.length > 0 ? (
          <div className="grid gap-6 md:grid-cols-2">
            {extras.fields.map((field, index) => (
              <ExtraChallengerFields
                key={field.id}
                index={index}
                register={register}
                errors={errors.moreChallengers?.[index]}
                columnOptions={columnOptions}
                onRemove={() => extras.remove(index)}
              />
            ))}
          </div>
        ) : null}
        {errors.moreChallengers?.root?.message || errors.moreChallengers?.message ? (
          <p className="text-sm text-bad" role="alert">
            {errors.moreChallengers?.root?.message ?? errors.moreChallengers?.message}
          </p>
        ) : null}
        {extras.fields.length < MAX_CHALLENGERS - 1 ? (
          <Button type="button" size="sm" onClick={() => extras.append({ column: '', higherIs: 'safer', name: '' })}>
            Add a challenger
          </Button>
        ) : (
          <p className="text-sm text-ink-soft">A comparison holds at most {MAX_CHALLENGERS} challengers.</p>
        )}
      </fieldset>

      <fieldset className="grid gap-4 md:grid-cols-2">
        <legend className="mb-2 text-base font-semibold text-ink">Optional columns</legend>
        <Select label="Account id" optional hint="Names accounts in the swap-list export and finds duplicates." error={errors.id?.message} options={[none, ...columnOptions]} {...register('id')} />
        <Select label="Exposure or amount" optional hint="Summed in the swap sets (e.g. the loan amount)." error={errors.exposure?.message} options={[none, ...numericOptions]} {...register('exposure')} />
        <Select
          label="Sampling weight"
          optional
          hint="How many applicants each row stands for (e.g. 4 when goods were sampled one in four). Every row needs a positive number."
          error={errors.weight?.message}
          options={[none, ...numericOptions]}
          {...register('weight')}
        />
        <Select
          label="Month or vintage"
          optional
          hint="Both models and the uplift by period, on the Stability tab."
          error={errors.period?.message}
          options={[none, ...columnOptions]}
          {...register('period')}
        />
        <CheckboxGroup
          legend="Segments"
          hint={segmentCandidates.length > 0 ? 'Both models are compared within each value of these columns (with a Holm adjustment).' : 'No column has few enough distinct values to be a segment.'}
          error={errors.segments?.message}
          className="md:col-span-2"
        >
          <div className="flex flex-wrap gap-x-6 gap-y-2">
            {segmentCandidates.map((column) => (
              <Checkbox key={column.name} value={column.name} label={<code className="font-mono text-xs">{column.name}</code>} hint={`${column.distinct} values`} {...register('segments')} />
            ))}
          </div>
        </CheckboxGroup>
        <Checkbox
          className="md:col-span-2"
          label="Leave out rows with an empty score"
          hint="Otherwise an empty score stops the check with its row and column. Rows left out are counted in the report."
          {...register('dropMissing')}
        />
      </fieldset>

      <fieldset className="grid gap-4 md:grid-cols-2">
        <legend className="mb-2 text-base font-semibold text-ink">Applicants without an outcome</legend>
        <Checkbox
          className="md:col-span-2"
          label="Keep applicants without an outcome"
          hint="For a through-the-door sample: applicants the champion declined were never booked, so they have no outcome. They count in approval rates, cut-offs and swap sets; AUC, KS and bad rates use the rows with an outcome. Without this, an empty outcome stops the check with its row and column."
          {...register('keepUnknown')}
        />
        {values.keepUnknown ? (
          <>
            <TextField
              label="Values that also mean no outcome"
              optional
              hint="Separated by commas, e.g. R, reject, -1. An empty outcome always means no outcome."
              error={errors.unknownValues?.message}
              {...register('unknownValues')}
            />
            <Select
              label="Inferred probability of bad"
              optional
              hint="A column with each unknown applicant's probability of bad, 0 to 1 (e.g. from bureau performance at other lenders). Needed on every row without an outcome; used by reject inference by column."
              error={errors.inferredBad?.message}
              options={[none, ...numericOptions]}
              {...register('inferredBad')}
            />
          </>
        ) : null}
      </fieldset>

      <div className="flex flex-wrap gap-2 border-t border-line pt-4">
        <Button type="submit" variant="primary" loading={busy} loadingText="Checking every row…">
          Check the data
        </Button>
      </div>
    </form>
  );
}

function ScoreFields({
  model,
  holdout,
  register,
  values,
  error,
  columnOptions,
  pdError,
  gradeError,
  nameError,
  several = false,
}: {
  model: 'champion' | 'challenger';
  holdout: HoldoutInfo;
  register: UseFormRegister<MappingFormValues>;
  values: DeepPartial<MappingFormValues>;
  error?: string;
  columnOptions: { value: string; label: string }[];
  pdError?: string;
  gradeError?: string;
  nameError?: string;
  /** The comparison has more challengers: this one is the first of them. */
  several?: boolean;
}) {
  const column = values[model];
  const chosen = values.higherIs?.[model];
  const { guess } = holdout;
  // The hints are about the guessed columns; follow the column, wherever the person put it.
  const hintFor = (name: string | undefined): { text: string; higherIs: HigherIs | null } | null => {
    if (!name) return null;
    if (name === guess.champion && guess.orientationHints.champion) return { text: guess.orientationHints.champion, higherIs: guess.higherIs.champion };
    if (name === guess.challenger && guess.orientationHints.challenger) return { text: guess.orientationHints.challenger, higherIs: guess.higherIs.challenger };
    return null;
  };
  const hint = hintFor(column);
  const disagrees = hint?.higherIs && chosen && hint.higherIs !== chosen;
  const title = model === 'champion' ? 'Champion (the model in production)' : several ? 'Challenger 1 (the first candidate)' : 'Challenger (the candidate)';
  return (
    <fieldset className="space-y-4 rounded-lg border border-line p-4">
      <legend className="px-1">
        <ModelTag model={model} />
      </legend>
      <p className="-mt-2 text-sm text-ink-soft">{title}</p>
      <Select label={`${model === 'champion' ? 'Champion' : 'Challenger'} score column`} error={error} options={[{ value: '', label: 'Choose a column' }, ...columnOptions]} {...register(model)} />
      <TextField
        label={`${model === 'champion' ? 'Champion' : 'Challenger'} name`}
        optional
        hint={`How the pages, report and e-mails name it, e.g. "${model === 'champion' ? 'CF-2 scorecard' : 'CF-3 bureau'}". Empty: the column name.`}
        error={nameError}
        autoComplete="off"
        {...register(model === 'champion' ? 'championName' : 'challengerName')}
      />
      <RadioGroup legend="Orientation" inline hint={hint ? `From the data: ${hint.text}.` : column ? 'No hint from the data for this column: check which way it points.' : undefined}>
        <Radio value="safer" label="Higher is safer" hint="points" {...register(`higherIs.${model}`)} />
        <Radio value="riskier" label="Higher is riskier" hint="a PD" {...register(`higherIs.${model}`)} />
      </RadioGroup>
      <Checkbox
        label="This score is a probability of default"
        hint="Values from 0 to 1, higher = riskier: its calibration (Jeffreys test by band or grade) is computed."
        error={pdError}
        {...register(`pd.${model}`)}
      />
      <Select label="Rating grade column" optional hint="Calibration by grade instead of by band." error={gradeError} options={[{ value: '', label: 'None' }, ...columnOptions]} {...register(`grades.${model}`)} />
      {disagrees ? (
        <Callout tone="caution" title="The data point the other way">
          <p>
            You chose {orientationWords[chosen]}, but the data suggest {orientationWords[hint.higherIs!]}. A wrong orientation turns the Gini
            negative.
          </p>
        </Callout>
      ) : null}
    </fieldset>
  );
}

/** A challenger after the first: its score column, orientation and name (no PD flag or grades). */
function ExtraChallengerFields({
  index,
  register,
  errors,
  columnOptions,
  onRemove,
}: {
  index: number;
  register: UseFormRegister<MappingFormValues>;
  errors?: FieldErrors<MappingFormValues['moreChallengers'][number]>;
  columnOptions: { value: string; label: string }[];
  onRemove: () => void;
}) {
  const number = index + 2;
  return (
    <fieldset className="space-y-4 rounded-lg border border-line p-4" data-testid={`challenger-${number}`}>
      <legend className="px-1">
        <ModelTag model="challenger" />
      </legend>
      <p className="-mt-2 text-sm text-ink-soft">Challenger {number}</p>
      <Select
        label={`Challenger ${number} score column`}
        error={errors?.column?.message}
        options={[{ value: '', label: 'Choose a column' }, ...columnOptions]}
        {...register(`moreChallengers.${index}.column`)}
      />
      <TextField
        label={`Challenger ${number} name`}
        optional
        hint='E.g. "CF-4 open banking". Empty: the column name.'
        error={errors?.name?.message}
        autoComplete="off"
        {...register(`moreChallengers.${index}.name`)}
      />
      <RadioGroup legend={`Challenger ${number} orientation`} inline error={errors?.higherIs?.message}>
        <Radio value="safer" label="Higher is safer" hint="points" {...register(`moreChallengers.${index}.higherIs`)} />
        <Radio value="riskier" label="Higher is riskier" hint="a PD" {...register(`moreChallengers.${index}.higherIs`)} />
      </RadioGroup>
      <Button type="button" size="sm" variant="ghost" onClick={onRemove}>
        Remove challenger {number}
      </Button>
    </fieldset>
  );
}
