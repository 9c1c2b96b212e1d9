/**
 * The plant's password policy, in one place: used when an administrator sets a password at
 * account creation, when someone changes their own, and when a reset link is used.
 *
 *   1. At least `minPasswordLength` characters (a setting, default 12; counted as characters a
 *      person types, not bytes).
 *   2. Not a common password, nor one built from common passwords, words, keyboard rows,
 *      sequences, repeats, dates or the person's own e-mail and name: zxcvbn-ts, with its list of
 *      common passwords (@zxcvbn-ts/language-common) and its
 *      English dictionaries, must rate it at least 3 of 4 ("safely unguessable": an estimated
 *      10^8 guesses or more). A password found whole in the common list is refused whatever the
 *      score.
 *
 * Each refusal is a 400 naming the field (`password` or `newPassword`) and what is wrong.
 * The dictionaries are loaded on first use (they take a moment and some memory), not at start.
 */
import { fieldError } from '../../errors';
import type { DbOrTx } from '../../db/client';
import { readSetting } from '../settings';

export type PasswordField = 'password' | 'newPassword';

/** What the password must not be built from besides the common lists: who it belongs to, and the program. */
export interface PasswordContext {
  email?: string;
  name?: string;
}

/** zxcvbn's score a password must reach: 3 = "safely unguessable: moderate protection from an offline slow-hash scenario". */
export const MIN_STRENGTH_SCORE = 3;

interface Checker {
  check(password: string, userInputs: string[]): { score: number; feedback: { warning: string | null; suggestions: string[] } };
  common: ReadonlySet<string>;
}

let checker: Promise<Checker> | null = null;

function loadChecker(): Promise<Checker> {
  checker ??= (async () => {
    const [{ ZxcvbnFactory }, common, en] = await Promise.all([
      import('@zxcvbn-ts/core'),
      import('@zxcvbn-ts/language-common'),
      import('@zxcvbn-ts/language-en'),
    ]);
    const factory = new ZxcvbnFactory({
      dictionary: { ...common.dictionary, ...en.dictionary },
      graphs: common.adjacencyGraphs,
      translations: en.translations,
    });
    const list = new Set(common.dictionary['passwords-common'].map((p) => p.toLowerCase()));
    const loaded: Checker = {
      check: (password: string, userInputs: string[]) => factory.check(password, userInputs),
      common: list,
    };
    return loaded;
  })().catch((err: unknown) => {
    checker = null;
    throw err;
  });
  return checker;
}

/** Loads the dictionaries now (e.g. at server start in the background), so the first check is quick. */
export function warmPasswordPolicy(): Promise<void> {
  return loadChecker().then(() => undefined);
}

/** The words a password must not lean on: the person's e-mail (whole and its parts), name, and the program's own name. */
function contextWords(ctx: PasswordContext): string[] {
  const words = new Set<string>(['tacklog']);
  if (ctx.email) {
    const email = ctx.email.toLowerCase();
    words.add(email);
    for (const part of email.split(/[@._+-]+/)) if (part.length >= 3) words.add(part);
  }
  if (ctx.name) for (const part of ctx.name.toLowerCase().split(/\s+/)) if (part.length >= 3) words.add(part);
  return [...words];
}

export interface PasswordVerdict {
  ok: boolean;
  /** What is wrong, as the end of a sentence naming the field: "must be at least 12 characters". */
  problem?: string;
}

/** Judges a password against the policy without throwing (for tests and forms). */
export async function judgePassword(password: string, ctx: PasswordContext = {}, tx?: DbOrTx): Promise<PasswordVerdict> {
  const minLength = await readSetting('minPasswordLength', tx);
  const length = [...password].length;
  if (length < minLength) return { ok: false, problem: `must be at least ${minLength} characters (it has ${length})` };
  const { check, common } = await loadChecker();
  if (common.has(password.toLowerCase())) {
    return { ok: false, problem: 'is on the list of common passwords; choose another' };
  }
  const words = contextWords(ctx);
  const lower = password.toLowerCase();
  if (ctx.email && lower.includes(ctx.email.toLowerCase())) return { ok: false, problem: 'must not contain your e-mail address' };
  const result = check(password, words);
  if (result.score < MIN_STRENGTH_SCORE) {
    const why = result.feedback.warning ? ` (${result.feedback.warning.replace(/\.$/, '').toLowerCase()})` : '';
    return {
      ok: false,
      problem: `is too easy to guess${why}: it is a common password or built from one, from words, names, dates or keyboard patterns; a few unrelated words or a longer phrase work well`,
    };
  }
  return { ok: true };
}

/** Throws a 400 naming `field` when the password breaks the policy. */
export async function enforcePasswordPolicy(field: PasswordField, password: string, ctx: PasswordContext = {}, tx?: DbOrTx): Promise<void> {
  const verdict = await judgePassword(password, ctx, tx);
  if (!verdict.ok) throw fieldError(field, verdict.problem!);
}
