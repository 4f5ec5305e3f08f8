import { type KeyboardEvent, type ReactNode, type RefObject, useEffect, useId, useRef } from 'react';
import { cn } from '@/lib/cn';
import { Button } from '@/components/button';
import { CrossIcon } from '@/components/icons';

const FOCUSABLE = [
  'a[href]',
  'button:not([disabled])',
  'input:not([disabled]):not([type="hidden"])',
  'select:not([disabled])',
  'textarea:not([disabled])',
  '[tabindex]:not([tabindex="-1"])',
].join(',');

function focusables(root: HTMLElement): HTMLElement[] {
  return Array.from(root.querySelectorAll<HTMLElement>(FOCUSABLE)).filter((element) => !element.closest('[inert]'));
}

type DialogProps = {
  open: boolean;
  /** Called on Esc, the close button, or a Cancel button that calls it. */
  onClose: () => void;
  title: ReactNode;
  description?: ReactNode;
  children?: ReactNode;
  /** Buttons at the bottom, right-aligned. */
  footer?: ReactNode;
  size?: 'sm' | 'md' | 'lg';
  /** The element to focus on open; default: the first field or button in the body. */
  initialFocus?: RefObject<HTMLElement | null>;
  /** Disable Esc and the close button while something is being saved. */
  busy?: boolean;
};

/**
 * A modal dialog on the native <dialog> element opened with showModal(): the page behind is inert,
 * Esc closes it, focus moves in on open, Tab cycles inside it, and focus returns to the element
 * that opened it. aria-modal, aria-labelledby and aria-describedby are set. The body is rendered
 * only while open, so forms inside start fresh each time.
 */
export function Dialog({ open, onClose, title, description, children, footer, size = 'md', initialFocus, busy = false }: DialogProps) {
  const ref = useRef<HTMLDialogElement>(null);
  const returnFocus = useRef<HTMLElement | null>(null);
  const titleId = useId();
  const descriptionId = useId();

  useEffect(() => {
    const dialog = ref.current;
    if (!dialog) return;
    if (open && !dialog.open) {
      returnFocus.current = document.activeElement instanceof HTMLElement ? document.activeElement : null;
      dialog.showModal();
      const target = initialFocus?.current ?? focusables(dialog.querySelector<HTMLElement>('[data-dialog-body]') ?? dialog)[0];
      (target ?? dialog).focus();
    } else if (!open && dialog.open) {
      dialog.close();
      returnFocus.current?.focus();
    }
  }, [open, initialFocus]);

  // Close on unmount too, so focus is never left inside a removed dialog.
  useEffect(() => {
    const dialog = ref.current;
    return () => {
      if (dialog?.open) dialog.close();
    };
  }, []);

  const onKeyDown = (event: KeyboardEvent<HTMLDialogElement>) => {
    if (event.key !== 'Tab' || !ref.current) return;
    const items = focusables(ref.current);
    if (items.length === 0) {
      event.preventDefault();
      return;
    }
    const first = items[0];
    const last = items[items.length - 1];
    if (event.shiftKey && document.activeElement === first) {
      event.preventDefault();
      last.focus();
    } else if (!event.shiftKey && document.activeElement === last) {
      event.preventDefault();
      first.focus();
    }
  };

  const widths = { sm: 'max-w-md', md: 'max-w-lg', lg: 'max-w-3xl' };

  return (
    <dialog
      ref={ref}
      aria-modal="true"
      aria-labelledby={titleId}
      aria-describedby={description ? descriptionId : undefined}
      onCancel={(event) => {
        // Esc: let React state decide, so the dialog never closes behind the app's back.
        event.preventDefault();
        if (!busy) onClose();
      }}
      onKeyDown={onKeyDown}
      tabIndex={-1}
      className={cn(
        'm-auto w-[calc(100%-2rem)] rounded-lg border border-line bg-paper-raised p-0 text-ink shadow-xl backdrop:bg-court-900/40',
        'focus:outline-none',
        widths[size],
      )}
    >
      {open ? (
        <div className="flex max-h-[85vh] flex-col">
          <div className="flex items-start justify-between gap-4 border-b border-line px-5 py-4">
            <div className="min-w-0 space-y-1">
              <h2 id={titleId} className="text-base font-semibold">
                {title}
              </h2>
              {description ? (
                <p id={descriptionId} className="text-sm text-ink-soft">
                  {description}
                </p>
              ) : null}
            </div>
            <Button variant="ghost" size="sm" aria-label="Close" onClick={onClose} disabled={busy} className="-mr-2 px-1.5">
              <CrossIcon className="size-4" />
            </Button>
          </div>
          <div data-dialog-body className="overflow-y-auto px-5 py-4">
            {children}
          </div>
          {footer ? <div className="flex flex-wrap justify-end gap-2 border-t border-line bg-paper px-5 py-3">{footer}</div> : null}
        </div>
      ) : null}
    </dialog>
  );
}
