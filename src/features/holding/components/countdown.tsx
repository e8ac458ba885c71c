import { useEffect, useState } from 'react';

/**
 * The server's clock, ticking every second on the client: `serverNow` from the last fetch plus the
 * time passed locally since, so a tablet with a wrong clock still counts down right.
 */
export function useServerClock(serverNow: string | undefined): number {
  const [offset, setOffset] = useState(0);
  const [, setTick] = useState(0);
  useEffect(() => {
    if (serverNow) setOffset(Date.parse(serverNow) - Date.now());
  }, [serverNow]);
  useEffect(() => {
    const id = window.setInterval(() => setTick((n) => n + 1), 1000);
    return () => window.clearInterval(id);
  }, []);
  return Date.now() + offset;
}

/** '3:41:07' or '41:07' (hours, minutes, seconds), always positive. */
export function formatClock(ms: number): string {
  const total = Math.floor(Math.abs(ms) / 1000);
  const h = Math.floor(total / 3600);
  const m = Math.floor((total % 3600) / 60);
  const s = total % 60;
  const mm = String(m).padStart(2, '0');
  const ss = String(s).padStart(2, '0');
  return h > 0 ? `${h}:${mm}:${ss}` : `${m}:${ss}`;
}

/** The big live figure: time left to the deadline, time over it, or time elapsed without a limit. */
export function Countdown({ now, startedAt, deadlineAt, stoppedAt }: { now: number; startedAt: string; deadlineAt: string | null; stoppedAt: string | null }) {
  const end = stoppedAt ? Date.parse(stoppedAt) : now;
  if (!deadlineAt) {
    return (
      <p className="tabular text-5xl font-bold leading-none" aria-label={`Elapsed ${formatClock(end - Date.parse(startedAt))}`}>
        <span className="sr-only">Elapsed </span>{formatClock(end - Date.parse(startedAt))}
      </p>
    );
  }
  const left = Date.parse(deadlineAt) - end;
  return (
    <p className={`tabular text-5xl font-bold leading-none ${left <= 0 ? 'text-cherry' : ''}`} data-testid="countdown">
      {left <= 0 ? <span className="mr-2 text-board font-bold">Over by</span> : <span className="sr-only">Time left </span>}
      {formatClock(left)}
    </p>
  );
}
