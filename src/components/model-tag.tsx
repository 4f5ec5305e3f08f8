import { cn } from '@/lib/cn';
import { seriesStyles } from '@/components/charts/chart-theme';
import { SeriesSwatch } from '@/components/charts/series-marker';

export type ModelName = 'champion' | 'challenger';

/**
 * Which model a number belongs to: the model's line sample (colour, dash and marker, as in every
 * chart) and its name in words, optionally with its column.
 */
export function ModelTag({ model, column, className }: { model: ModelName; column?: string | null; className?: string }) {
  const style = seriesStyles[model];
  return (
    <span className={cn('inline-flex items-center gap-1.5 text-xs font-medium text-ink', className)}>
      <SeriesSwatch style={style} width={22} />
      <span>{style.label}</span>
      {column ? <code className="font-mono text-[0.7rem] font-normal text-ink-soft">{column}</code> : null}
    </span>
  );
}
