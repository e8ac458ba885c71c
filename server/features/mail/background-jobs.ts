import type { Logger } from '../../lib/logger';

export interface BackgroundJob {
  name: string;
  run(): Promise<unknown>;
}

/**
 * Runs each job every intervalMs, one round at a time (a slow round is never overlapped by the
 * next). Started by server/index.ts only, never by createApp, so tests call the jobs directly.
 */
export function startBackgroundJobs(jobs: BackgroundJob[], opts: { intervalMs: number; logger?: Logger }): { stop(): Promise<void> } {
  let stopped = false;
  let timer: NodeJS.Timeout | undefined;
  let round: Promise<void> = Promise.resolve();
  const tick = async () => {
    for (const job of jobs) {
      if (stopped) return;
      try {
        await job.run();
      } catch (err) {
        // The database may be down for a while; the next round tries again.
        opts.logger?.warn({ event: 'background_job_failed', job: job.name, err: String((err as Error)?.message ?? err) }, 'background job failed');
      }
    }
  };
  const schedule = () => {
    if (stopped) return;
    timer = setTimeout(() => {
      round = tick().finally(schedule);
    }, opts.intervalMs);
    timer.unref();
  };
  round = tick().finally(schedule);
  return {
    async stop() {
      stopped = true;
      if (timer) clearTimeout(timer);
      await round.catch(() => undefined);
    },
  };
}
