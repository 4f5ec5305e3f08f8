import { Callout } from '@/components/callout';

/**
 * The cautions docs/design.md asks for wherever a decision is made: significance is not approval, a
 * new model changes who is approved and declined, and the institution's own rules come first.
 */
export function DecisionCautions({ className, compact = false }: { className?: string; compact?: boolean }) {
  return (
    <Callout tone="caution" title="Before anyone acts on this" className={className}>
      <ul className={compact ? 'space-y-1' : 'list-disc space-y-1 pl-4'}>
        <li>Statistical significance is not business approval: the verdict advises, the committee decides.</li>
        <li>
          A new model changes who is approved and who is declined, so fair-lending and adverse-action duties apply to the swap-in and swap-out
          groups.
        </li>
        <li>Follow your institution’s model risk policy, local regulation and licensed advice.</li>
      </ul>
    </Callout>
  );
}
