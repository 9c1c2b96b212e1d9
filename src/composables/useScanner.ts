import { ref } from 'vue';

/**
 * A keyboard-wedge scanner types the code into the focused field and ends it with Enter (or
 * Tab). GS1 barcodes end variable-length fields with the group separator GS (0x1D, FNC1 in the
 * symbol; GS1 General Specifications §7.8.5); a scanner in keyboard mode sends it as Ctrl+]
 * (the ASCII control key for 0x1D), which a browser does not type into a field, so it is put in
 * here. The typed or scanned code is handed to `onScan` once; Enter while a scan is being
 * handled is ignored, and the very same code read again within `repeatMs` (a double read) too.
 */

export const GROUP_SEPARATOR = '\u001d';

/** Trims what a wedge adds around a code (spaces, CR/LF/Tab); keeps GS inside the code. */
export function cleanScan(raw: string): string {
  return raw.replace(/^[\s]+|[\s]+$/g, '');
}

export interface KeyLike {
  key: string;
  ctrlKey?: boolean;
  altKey?: boolean;
  metaKey?: boolean;
}

/** What a key press means to the scan field: submit, a character to insert, or nothing special. */
export function scanKeyAction(event: KeyLike): { kind: 'submit' } | { kind: 'insert'; text: string } | { kind: 'none' } {
  if (event.key === 'Enter') return { kind: 'submit' };
  // Ctrl+] is ASCII 0x1D (GS); some wedges send the raw character as the key instead.
  if ((event.ctrlKey && event.key === ']') || event.key === GROUP_SEPARATOR) {
    return { kind: 'insert', text: GROUP_SEPARATOR };
  }
  return { kind: 'none' };
}

export interface ScannerOptions {
  onScan: (code: string) => unknown;
  /** The same code again within this many ms is taken as a double read and ignored (0: never). */
  repeatMs?: number;
  /** Clock, for tests. */
  clock?: () => number;
}

export function useScanner(options: ScannerOptions) {
  const value = ref('');
  const busy = ref(false);
  const repeatMs = options.repeatMs ?? 800;
  const clock = options.clock ?? (() => Date.now());
  let last: { code: string; at: number } | null = null;

  /** Hands the field's code to onScan; returns whether it did. */
  async function submit(): Promise<boolean> {
    const code = cleanScan(value.value);
    if (!code || busy.value) return false;
    const at = clock();
    if (last && last.code === code && repeatMs > 0 && at - last.at < repeatMs) {
      value.value = '';
      return false;
    }
    last = { code, at };
    value.value = '';
    busy.value = true;
    try {
      await options.onScan(code);
    } finally {
      busy.value = false;
    }
    return true;
  }

  /**
   * keydown handler for the input: Enter submits; Ctrl+] inserts GS at the caret.
   * `insertAt(text)` lets the field put the character where the caret is (default: at the end).
   */
  function onKeydown(event: KeyLike & { preventDefault?: () => void }, insertAt?: (text: string) => void): void {
    const action = scanKeyAction(event);
    if (action.kind === 'none') return;
    event.preventDefault?.();
    if (action.kind === 'submit') {
      // onScan shows its own failures; one that escapes it is a bug worth seeing in the console.
      submit().catch((err: unknown) => console.error('[scanner] scan handler failed:', err));
    } else if (insertAt) {
      insertAt(action.text);
    } else {
      value.value += action.text;
    }
  }

  /** The code shown to a person: GS as a visible mark. */
  function display(code: string): string {
    return code.split(GROUP_SEPARATOR).join('⟨GS⟩');
  }

  return { value, busy, submit, onKeydown, display };
}
