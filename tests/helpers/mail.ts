/**
 * Mail in tests: a local catcher (the same one `npm start` uses) whose test hooks can refuse a
 * recipient or hold a message, the outbox worker pointed at it, and a second process to race.
 *
 *   const mail = await startTestMail();            // catcher + transport for this process
 *   await drainOutbox();                           // send what is due
 *   await capturedFor('someone@tacklog.test');      // what the catcher received for them
 *   mail.hooks.rcpt = (to) => { … };                // refuse or hold (set back to undefined after)
 */
import { spawn } from 'node:child_process';
import path from 'node:path';
import { fileURLToPath } from 'node:url';
import { desc, sql } from 'drizzle-orm';
import { db } from '../../server/db/client';
import { capturedEmails } from '../../server/db/schema';
import { startMailCatcher, type CatcherHooks, type MailCatcher } from '../../server/services/mail/catcher';
import { catcherTransport, setMailTransport, type MailTransport } from '../../server/services/mail/transport';

const root = path.resolve(path.dirname(fileURLToPath(import.meta.url)), '..', '..');

export interface TestMail {
  catcher: MailCatcher;
  transport: MailTransport;
  /** Mutable: set a hook for one test, clear it after. */
  hooks: CatcherHooks;
  close(): Promise<void>;
}

export async function startTestMail(): Promise<TestMail> {
  const hooks: CatcherHooks = {};
  const catcher = await startMailCatcher({
    hooks: {
      rcpt: (a) => hooks.rcpt?.(a),
      afterStore: (m) => hooks.afterStore?.(m),
    },
  });
  const transport = catcherTransport(catcher.port);
  setMailTransport(transport);
  return {
    catcher,
    transport,
    hooks,
    close: async () => {
      setMailTransport(null);
      transport.close();
      await catcher.close();
    },
  };
}

/** Messages the catcher received with `email` among the envelope recipients, newest first. */
export function capturedFor(email: string) {
  return db
    .select()
    .from(capturedEmails)
    .where(sql`${email.toLowerCase()} = ANY(SELECT lower(x) FROM unnest(${capturedEmails.envelopeTo}) AS x)`)
    .orderBy(desc(capturedEmails.receivedAt));
}

export interface ChildRun {
  pid: number;
  /** Resolves with the child's JSON result line (or rejects when it exits with an error). */
  done: Promise<Record<string, number>>;
  kill(): Promise<void>;
}

/** Starts tests/helpers/mail-child.ts as a second server process against the same database. */
export function runMailChild(env: Record<string, string>): ChildRun {
  const child = spawn(process.execPath, ['--import', 'tsx', path.join(root, 'tests/helpers/mail-child.ts')], {
    cwd: root,
    env: { ...process.env, ...env },
    stdio: ['ignore', 'pipe', 'pipe'],
  });
  let out = '';
  let err = '';
  child.stdout.on('data', (c: Buffer) => (out += c.toString()));
  child.stderr.on('data', (c: Buffer) => (err += c.toString()));
  const exited = new Promise<number | null>((resolve) => child.once('exit', (code) => resolve(code)));
  const done = exited.then((code) => {
    if (code !== 0) throw new Error(`mail child exited ${code}: ${err}`);
    return JSON.parse(out.trim().split('\n').pop() ?? '{}') as Record<string, number>;
  });
  done.catch(() => undefined); // a killed child is expected; tests that await `done` still see the error
  return {
    pid: child.pid ?? 0,
    done,
    kill: async () => {
      child.kill('SIGKILL');
      await exited;
    },
  };
}

/** A promise and its resolve, for holding a hook until the test lets go. */
export function gate<T = void>(): { promise: Promise<T>; open(value: T): void } {
  let open!: (value: T) => void;
  const promise = new Promise<T>((resolve) => (open = resolve));
  return { promise, open };
}
