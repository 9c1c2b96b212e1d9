/** sessionStorage key: the general safety caution was shown in this sign-in. */
export const CAUTION_SEEN_KEY = 'tacklog.safety.cautionSeen';

/** Forgets it at sign-out, so the next person to sign in on this device sees it. */
export function forgetCautionSeen(): void {
  try {
    sessionStorage.removeItem(CAUTION_SEEN_KEY);
  } catch (err) {
    console.warn('[safety] could not reset the caution:', err);
  }
}
