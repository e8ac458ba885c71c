import { spawn, type ChildProcess } from 'node:child_process';
import readline from 'node:readline';

export interface ChildServer {
  child: ChildProcess;
  port: number;
  url: string;
  /** Ends the process with the signal and waits until it is gone. */
  kill(signal?: NodeJS.Signals): Promise<void>;
}

/**
 * Starts a tsx entry (default tests/support/app-server.ts) as its own process and waits for its
 * {"port":N} line. `cpu` pins it with taskset where available, so a load generator can have another core.
 */
export async function startChildServer(env: Record<string, string>, options: { entry?: string; cpu?: number } = {}): Promise<ChildServer> {
  const entry = options.entry ?? 'tests/support/app-server.ts';
  // node --import tsx keeps it one process (the tsx CLI would fork a child that SIGKILL leaves behind).
  const tsx = [process.execPath, '--import', 'tsx', entry];
  const [cmd, ...args] = options.cpu === undefined ? tsx : ['taskset', '-c', String(options.cpu), ...tsx];
  const child = spawn(cmd!, args, { env: { ...process.env, ...env }, stdio: ['ignore', 'pipe', 'pipe'] });
  let stderr = '';
  child.stderr!.on('data', (d: Buffer) => { stderr = (stderr + d.toString()).slice(-4000); });
  const exited = new Promise<void>((resolve) => child.once('exit', () => resolve()));
  const port = await new Promise<number>((resolve, reject) => {
    const timer = setTimeout(() => reject(new Error(`${entry} did not start in 30 s: ${stderr}`)), 30_000);
    child.once('exit', (code) => { clearTimeout(timer); reject(new Error(`${entry} exited with ${code}: ${stderr}`)); });
    readline.createInterface({ input: child.stdout! }).once('line', (line) => {
      clearTimeout(timer);
      resolve((JSON.parse(line) as { port: number }).port);
    });
  });
  return {
    child,
    port,
    url: `http://127.0.0.1:${port}`,
    async kill(signal = 'SIGTERM') {
      if (child.exitCode === null && child.signalCode === null) child.kill(signal);
      await exited;
    },
  };
}
