import { useEffect, useId, useRef, type ReactNode } from 'react';
import { cn } from '@/lib/cn';

export interface DialogProps {
  isOpen: boolean;
  /** Called on Escape, the close button, or a cancel; the parent sets isOpen false. */
  onClose: () => void;
  title: string;
  /** Optional one-line summary read out with the title. */
  description?: ReactNode;
  children?: ReactNode;
  /** Buttons shown at the bottom (put the safe choice first). */
  actions?: ReactNode;
  /** role="alertdialog" for warnings that need an answer (session ending, confirm discard). */
  isAlert?: boolean;
  className?: string;
}

/**
 * A modal built on the native <dialog>: the browser keeps focus inside and makes the page inert.
 * Focus goes to the first control marked `autoFocus` (or the dialog) and returns where it was on close.
 */
export function Dialog({ isOpen, onClose, title, description, children, actions, isAlert, className }: DialogProps) {
  const ref = useRef<HTMLDialogElement>(null);
  const returnTo = useRef<HTMLElement | null>(null);
  const titleId = useId();
  const descId = useId();

  useEffect(() => {
    const dialog = ref.current;
    if (!dialog) return;
    if (isOpen && !dialog.open) {
      returnTo.current = document.activeElement instanceof HTMLElement ? document.activeElement : null;
      dialog.showModal();
      const auto = dialog.querySelector<HTMLElement>('[autofocus],[data-autofocus]');
      (auto ?? dialog).focus();
    } else if (!isOpen && dialog.open) {
      dialog.close();
      returnTo.current?.focus();
    }
  }, [isOpen]);

  useEffect(() => {
    const dialog = ref.current;
    return () => {
      if (dialog?.open) dialog.close();
    };
  }, []);

  return (
    <dialog
      ref={ref}
      role={isAlert ? 'alertdialog' : undefined}
      aria-labelledby={titleId}
      aria-describedby={description ? descId : undefined}
      tabIndex={-1}
      onCancel={(e) => {
        e.preventDefault();
        onClose();
      }}
      className={cn('m-auto w-[min(32rem,calc(100vw-2rem))] rounded-card border border-edge bg-surface p-0 text-ink shadow-xl', className)}
    >
      {isOpen ? (
        <div className="p-6">
          <h2 id={titleId} className="text-xl font-bold">
            {title}
          </h2>
          {description ? (
            <div id={descId} className="mt-2">
              {description}
            </div>
          ) : null}
          {children ? <div className="mt-4">{children}</div> : null}
          {actions ? <div className="mt-6 flex flex-wrap justify-end gap-3">{actions}</div> : null}
        </div>
      ) : null}
    </dialog>
  );
}
