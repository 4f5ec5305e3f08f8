import { useId } from 'react';
import { type SwapQuery } from '@shared/comparisons';
import { type HigherIs, type Report, type SwapSets } from '@shared/report';
import { formatPercent, formatScore } from '@/lib/format';
import { ModelTag } from '@/components/model-tag';
import { PercentField } from '@/components/percent-field';
import { Radio, RadioGroup } from '@/components/radio-group';
import { type ScoreRange, acceptanceRule, scoreRange, snapToRange } from '@/features/swap-sets/lib/swap-controls';

type SwapControlsProps = {
  report: Report;
  /** What the person asked for (updates at once, as they move a slider). */
  value: SwapQuery;
  /** The swap sets shown (the cut-offs and approval rates actually reached). */
  shown: SwapSets;
  onChange: (query: SwapQuery) => void;
};

/**
 * The settings of the swap sets: one approval rate that sets both models' cut-offs, or a cut-off
 * per model in its own units and orientation. Each has a number field and a slider.
 */
export function SwapControls({ report, value, shown, onChange }: SwapControlsProps) {
  const mode = value.cutoffs ? 'cutoffs' : 'approval-rate';
  const rate = value.approvalRate ?? shown.champion.approvalRate;
  const cutoffs = value.cutoffs ?? { champion: shown.champion.cutoff, challenger: shown.challenger.cutoff };
  const ranges = { champion: scoreRange(report.dataQuality.champion), challenger: scoreRange(report.dataQuality.challenger) };

  return (
    <div className="space-y-5">
      <RadioGroup legend="Set the swap sets by" inline>
        <Radio
          name="swap-mode"
          value="approval-rate"
          label="One approval rate for both models"
          checked={mode === 'approval-rate'}
          onChange={() => onChange({ approvalRate: Number(shown.champion.approvalRate.toFixed(3)) })}
        />
        <Radio
          name="swap-mode"
          value="cutoffs"
          label="A cut-off for each model"
          checked={mode === 'cutoffs'}
          onChange={() => onChange({ cutoffs: { champion: shown.champion.cutoff, challenger: shown.challenger.cutoff } })}
        />
      </RadioGroup>

      {mode === 'approval-rate' ? (
        <RateControl rate={rate} onChange={(approvalRate) => onChange({ approvalRate })} shown={shown} />
      ) : (
        <div className="grid gap-5 md:grid-cols-2">
          {(['champion', 'challenger'] as const).map((model) => (
            <CutoffControl
              key={model}
              model={model}
              column={report.mapping[model]}
              higherIs={report[model].higherIs}
              range={ranges[model]}
              cutoff={cutoffs[model]}
              approvalRate={shown[model].approvalRate}
              onChange={(next) => onChange({ cutoffs: { ...cutoffs, [model]: next } })}
            />
          ))}
        </div>
      )}
    </div>
  );
}

function RateControl({ rate, onChange, shown }: { rate: number; onChange: (rate: number) => void; shown: SwapSets }) {
  const sliderId = useId();
  return (
    <div className="space-y-3">
      <div className="grid items-end gap-4 sm:grid-cols-[12rem_minmax(0,1fr)]">
        <PercentField
          label="Approval rate"
          value={rate}
          min={1}
          max={99}
          step={0.5}
          onChange={(fraction) => {
            if (Number.isFinite(fraction) && fraction > 0 && fraction < 1) onChange(fraction);
          }}
        />
        <div className="pb-2.5">
          <label htmlFor={sliderId} className="sr-only">
            Approval rate slider
          </label>
          <input
            id={sliderId}
            type="range"
            min={1}
            max={99}
            step={0.5}
            value={Math.round(rate * 200) / 2}
            aria-valuetext={formatPercent(rate)}
            onChange={(event) => onChange(Number(event.target.value) / 100)}
            className="w-full accent-court-700"
          />
          <div aria-hidden="true" className="num flex justify-between text-xs text-ink-faint">
            <span>1%</span>
            <span>50%</span>
            <span>99%</span>
          </div>
        </div>
      </div>
      <p className="text-sm text-ink-soft">
        Matched cut-offs: champion <span className="num font-medium text-ink">{formatScore(shown.champion.cutoff)}</span> (approves{' '}
        {formatPercent(shown.champion.approvalRate)}), challenger <span className="num font-medium text-ink">{formatScore(shown.challenger.cutoff)}</span>{' '}
        (approves {formatPercent(shown.challenger.approvalRate)}). Tied scores can make the rates reached differ a little from the rate asked.
      </p>
    </div>
  );
}

function CutoffControl({ model, column, higherIs, range, cutoff, approvalRate, onChange }: {
  model: 'champion' | 'challenger';
  column: string;
  higherIs: HigherIs;
  range: ScoreRange;
  cutoff: number;
  approvalRate: number;
  onChange: (cutoff: number) => void;
}) {
  const numberId = useId();
  const sliderId = useId();
  const hintId = useId();
  const name = model === 'champion' ? 'Champion' : 'Challenger';
  return (
    <fieldset className="space-y-2 rounded-lg border border-line p-3">
      <legend className="px-1">
        <ModelTag model={model} column={column} />
      </legend>
      <div className="grid items-end gap-3 sm:grid-cols-[9rem_minmax(0,1fr)]">
        <div className="space-y-1.5">
          <label htmlFor={numberId} className="block text-sm font-medium text-ink">
            {name} cut-off
          </label>
          <input
            id={numberId}
            type="number"
            min={range.sliderMin}
            max={range.sliderMax}
            step={range.step}
            value={cutoff}
            aria-describedby={hintId}
            onChange={(event) => {
              const next = Number(event.target.value);
              if (event.target.value !== '' && Number.isFinite(next)) onChange(snapToRange(next, range));
            }}
            className="block h-10 w-full rounded-md border border-line-strong bg-paper-raised px-3 text-sm text-ink focus:border-court-500 focus:outline-2 focus:outline-court-300"
          />
        </div>
        <div className="pb-2.5">
          <label htmlFor={sliderId} className="sr-only">
            {name} cut-off slider
          </label>
          <input
            id={sliderId}
            type="range"
            min={range.sliderMin}
            max={range.sliderMax}
            step={range.step}
            value={cutoff}
            aria-valuetext={`${formatScore(cutoff)}, approves ${formatPercent(approvalRate)}`}
            onChange={(event) => onChange(Number(event.target.value))}
            className="w-full accent-court-700"
            style={{ direction: higherIs === 'riskier' ? 'rtl' : 'ltr' }}
          />
          <div aria-hidden="true" className="num flex justify-between text-xs text-ink-faint">
            <span>{formatScore(higherIs === 'riskier' ? range.sliderMax : range.sliderMin)}</span>
            <span>{formatScore(higherIs === 'riskier' ? range.sliderMin : range.sliderMax)}</span>
          </div>
        </div>
      </div>
      <p id={hintId} className="text-sm text-ink-soft">
        {acceptanceRule(higherIs, formatScore(cutoff))}: approves <span className="num font-medium text-ink">{formatPercent(approvalRate)}</span>.
        Observed scores {formatScore(range.min)} to {formatScore(range.max)}.
      </p>
    </fieldset>
  );
}
