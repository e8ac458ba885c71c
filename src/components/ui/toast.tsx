import { createContext, useCallback, useContext, useEffect, useMemo, useRef, useState, type ReactNode } from 'react';
import { Icon } from './icon';

interface Toast {
  id: number;
  message: string;
}
interface ToastApi {
  /** Confirms a success ("Batch saved"); never use it instead of a field error. */
  showToast: (message: string) => void;
}

const ToastContext = createContext<ToastApi>({ showToast: () => undefined });

export function useToast(): ToastApi {
  return useContext(ToastContext);
}

/** Success confirmations in one polite live region (role=status), kept on screen for 6 s. */
export function ToastProvider({ children }: { children: ReactNode }) {
  const [toasts, setToasts] = useState<Toast[]>([]);
  const next = useRef(1);
  const timers = useRef(new Set<number>());
  const dismiss = useCallback((id: number) => setToasts((ts) => ts.filter((t) => t.id !== id)), []);
  const showToast = useCallback(
    (message: string) => {
      const id = next.current++;
      setToasts((ts) => [...ts.slice(-2), { id, message }]);
      const timer = window.setTimeout(() => {
        timers.current.delete(timer);
        dismiss(id);
      }, 6000);
      timers.current.add(timer);
    },
    [dismiss],
  );
  useEffect(() => {
    const all = timers.current;
    return () => all.forEach((t) => window.clearTimeout(t));
  }, []);
  const value = useMemo(() => ({ showToast }), [showToast]);
  return (
    <ToastContext.Provider value={value}>
      {children}
      <div role="status" aria-live="polite" className="pointer-events-none fixed inset-x-0 bottom-4 z-50 flex flex-col items-center gap-2 px-4" data-print="hide">
        {toasts.map((t) => (
          <div key={t.id} className="pointer-events-auto flex max-w-md items-center gap-3 rounded-card border border-pistachio bg-pistachio-soft px-4 py-3 text-ink shadow-lg">
            <Icon name="check" className="text-pistachio" />
            <span className="font-bold">{t.message}</span>
            <button type="button" onClick={() => dismiss(t.id)} className="ml-2 inline-flex size-8 items-center justify-center rounded-control text-ink hover:bg-surface" aria-label="Dismiss message">
              <Icon name="close" className="size-4" />
            </button>
          </div>
        ))}
      </div>
    </ToastContext.Provider>
  );
}
