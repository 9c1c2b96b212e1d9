import { eq } from 'drizzle-orm';
import { db, type DbOrTx } from '../../db/client';
import { settings } from '../../db/schema';

/**
 * The plant's named settings and their defaults. A row in the `settings` table with the same
 * key overrides the default; no rule in the services writes a bare number for these.
 */
export const SETTING_DEFAULTS = {
  /** The compliance watch reports steps started short of cure within this many days. */
  shortCureLookbackDays: 30,
  /** A lot whose expiry falls within this many days raises "expiring soon". */
  expiringSoonDays: 14,
  /** Lot failure statistics cover lots received within this many days. */
  lotStatsWindowDays: 365,
  /** False discovery rate for the Benjamini–Hochberg correction over lots. */
  falseDiscoveryRate: 0.05,
  /** Plant failure rate at final test used as the baseline when none is recorded (about 1 in 100: common practice). */
  baselineFailureRate: 0.01,
  /** The baseline is computed from final tests within this many days … */
  baselineWindowDays: 90,
  /** … when at least this many drivers were tested there (else the default above). */
  baselineMinTested: 200,
  /** A UV lamp whose last radiometer reading is older than this many days raises "radiometer check due". */
  lampCheckDays: 7,
  /** The assembler's home page lists cures ending within this many hours … */
  homeCureSoonHours: 4,
  /** … the first this many of them by name (the count covers them all). */
  homeCureSoonShown: 5,
  /** A CSV export of a list holds at most this many rows; more is refused (narrow the filters). */
  csvExportMaxRows: 100_000,
  /** Shortest password accepted (characters) when one is set, changed or reset. */
  minPasswordLength: 12,
  /** A password reset link an administrator sends works this many hours, once. */
  passwordResetHours: 24,
} as const;

export type SettingKey = keyof typeof SETTING_DEFAULTS;

/** A setting's value: the stored one when it is a number, else the default. */
export async function readSetting(key: SettingKey, tx: DbOrTx = db): Promise<number> {
  const [row] = await tx.select({ value: settings.value }).from(settings).where(eq(settings.key, key));
  const value = row?.value;
  return typeof value === 'number' && Number.isFinite(value) ? value : SETTING_DEFAULTS[key];
}
