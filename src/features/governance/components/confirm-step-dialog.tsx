import { type ReactNode } from 'react';
import { Button } from '@/components/button';
import { Dialog } from '@/components/dialog';

/**
 * The confirmation before an act of judgement that cannot be taken back (validate, return,
 * decide): what will happen, who is told by e-mail, and two buttons. Esc and Cancel send nothing.
 */
export function ConfirmStepDialog({
  open,
  title,
  children,
  recipients,
  confirmLabel,
  busy,
  onConfirm,
  onCancel,
}: {
  open: boolean;
  title: string;
  children: ReactNode;
  /** Who is told by e-mail, in words. */
  recipients: string;
  confirmLabel: string;
  busy: boolean;
  onConfirm: () => void;
  onCancel: () => void;
}) {
  return (
    <Dialog
      open={open}
      onClose={onCancel}
      title={title}
      size="md"
      busy={busy}
      footer={
        <>
          <Button variant="secondary" onClick={onCancel} disabled={busy}>
            Cancel
          </Button>
          <Button variant="primary" onClick={onConfirm} loading={busy} loadingText="Recording…">
            {confirmLabel}
          </Button>
        </>
      }
    >
      <div className="space-y-3 text-sm text-ink">
        {children}
        <p>
          <span className="font-medium">Sent by e-mail to:</span> {recipients}
        </p>
        <p className="text-ink-soft">Once recorded it cannot be changed or withdrawn; it stays in the comparison’s record and audit trail.</p>
      </div>
    </Dialog>
  );
}

/** "Ann", "Ann and Ben", "Ann, Ben and Cy"; `none` when empty. */
export function namesInWords(names: readonly string[], none: string): string {
  if (names.length === 0) return none;
  return names.length === 1 ? names[0] : `${names.slice(0, -1).join(', ')} and ${names.at(-1)}`;
}
