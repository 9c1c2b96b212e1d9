import type { Actor } from '../auth/actor';
import type { ScanResult } from '../../../shared/schemas/scans';

export interface ScanContext {
  actor: Actor;
  /** The scanned text with keyboard-wedge artefacts removed. */
  code: string;
  /** The scanner's symbology identifier said the data is GS1 (]C1, ]d2, ]Q3, ]e0, ]J1). */
  gs1Symbology: boolean;
}

/**
 * One kind of code Tacklog can resolve. `resolve` returns null when the code is not of its
 * kind (the next resolver is asked), the result when it is, and throws a 400 for a malformed
 * code of its kind or a 404 for a well-formed one that is not on record.
 */
export interface ScanResolver {
  type: string;
  resolve(ctx: ScanContext): Promise<ScanResult | null>;
}
