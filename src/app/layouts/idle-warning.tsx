import { useEffect, useRef, useState } from 'react';
import { useNavigate, useLocation } from 'react-router';
import { useQueryClient } from '@tanstack/react-query';
import { onServerContact } from '@/lib/api-client';
import { Dialog } from '@/components/ui/dialog';
import { Button } from '@/components/ui/button';
import { refreshSession, forgetSession } from '@/features/auth/api';
import { signInPath } from '../paths';

// WCAG 2.2.1 Timing Adjustable: warn before the idle limit with at least 20 s to respond; we give 2 minutes.
export const WARN_BEFORE_MS = 2 * 60 * 1000;
const ABSOLUTE_NOTICE_MS = 10 * 60 * 1000;

function formatLeft(ms: number): string {
  const s = Math.max(0, Math.ceil(ms / 1000));
  const m = Math.floor(s / 60);
  const r = s % 60;
  return m > 0 ? `${m} min ${String(r).padStart(2, '0')} s` : `${r} s`;
}

/**
 * Counts down the server's rolling idle limit (every answered request restarts it) and asks
 * "Stay signed in?" two minutes before the end. One click extends the session; it works every time.
 */
export function IdleWarning({ idleExpiresAt, absoluteExpiresAt }: { idleExpiresAt: string | null; absoluteExpiresAt: string | null }) {
  const qc = useQueryClient();
  const navigate = useNavigate();
  const location = useLocation();
  const here = useRef('');
  here.current = location.pathname + location.search;
  const [deadline, setDeadline] = useState<number | null>(null);
  const [now, setNow] = useState(() => Date.now());
  const [isExtending, setExtending] = useState(false);
  const [failed, setFailed] = useState('');

  // The idle window is measured once, from the session read at page load, on our own clock (so a
  // skewed device clock cancels out); every later answered request restarts it.
  const windowMs = useRef(0);
  const skewMs = useRef(0);
  useEffect(() => {
    if (!idleExpiresAt) return setDeadline(null);
    if (!windowMs.current) {
      const measured = Math.min(Math.max(Date.parse(idleExpiresAt) - Date.now(), 60_000), 12 * 60 * 60 * 1000);
      skewMs.current = Date.now() + measured - Date.parse(idleExpiresAt);
      // The server records activity at most once a minute, so a request may not have moved its limit: count a minute less.
      windowMs.current = Math.max(measured - 60_000, 60_000);
    }
    setDeadline(Date.now() + windowMs.current);
  }, [idleExpiresAt]);
  useEffect(() => onServerContact(() => windowMs.current && setDeadline(Date.now() + windowMs.current)), []);

  useEffect(() => {
    const id = window.setInterval(() => setNow(Date.now()), 1000);
    return () => window.clearInterval(id);
  }, []);

  const left = deadline === null ? Number.POSITIVE_INFINITY : deadline - now;
  // The absolute limit cannot be extended, so it gets an early, non-blocking notice instead.
  const absoluteAt = absoluteExpiresAt ? Date.parse(absoluteExpiresAt) + skewMs.current : null;
  const absoluteLeft = absoluteAt === null ? Number.POSITIVE_INFINITY : absoluteAt - now;
  const isWarning = left <= WARN_BEFORE_MS && left > 0;

  useEffect(() => {
    if (deadline !== null && left <= 0) {
      forgetSession(qc);
      navigate(signInPath(here.current, 'expired'), { replace: true });
    }
  }, [deadline, left, qc, navigate]);

  const stay = async () => {
    setExtending(true);
    setFailed('');
    try {
      const info = await refreshSession(qc);
      if (!info.user) {
        forgetSession(qc);
        navigate(signInPath(here.current, 'expired'), { replace: true });
      }
    } catch {
      setFailed('Could not reach Crumbtrail to keep you signed in. Check the connection and try again.');
    } finally {
      setExtending(false);
    }
  };

  return (
    <>
      {absoluteLeft <= ABSOLUTE_NOTICE_MS && absoluteAt !== null ? (
        <div role="status" className="fixed inset-x-0 top-16 z-20 mx-auto max-w-xl px-4" data-print="hide">
          <p className="rounded-card border border-honey bg-honey-soft p-3 text-ink shadow">
            <span className="font-bold">Signing out at {new Date(absoluteAt).toLocaleTimeString(undefined, { hour: '2-digit', minute: '2-digit' })}.</span> For safety a session has a fixed
            maximum length. Save what you are doing, then sign in again to carry on.
          </p>
        </div>
      ) : null}
    <Dialog
      isOpen={isWarning}
      onClose={() => void stay()}
      isAlert
      title="You will be signed out soon"
      description={
        <p>
          For safety, Crumbtrail signs you out after {Math.round(windowMs.current / 60_000)} minutes without activity. Time left:{' '}
          <span className="tabular font-bold">{formatLeft(left)}</span>. Anything you have typed stays in this tab.
        </p>
      }
      actions={
        <Button data-autofocus onClick={() => void stay()} isBusy={isExtending}>
          Stay signed in
        </Button>
      }
    >
      {failed ? (
        <p role="alert" className="font-bold text-cherry">
          {failed}
        </p>
      ) : null}
    </Dialog>
    </>
  );
}
