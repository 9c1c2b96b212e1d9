import { describe, expect, it } from 'vitest';
import { parseGs1 } from '../../shared/gs1';
import { GROUP_SEPARATOR, cleanScan, scanKeyAction, useScanner } from '../../src/composables/useScanner';

describe('scan keys', () => {
  it('submits on Enter (a keyboard wedge ends each read with Enter)', () => {
    expect(scanKeyAction({ key: 'Enter' })).toEqual({ kind: 'submit' });
    expect(scanKeyAction({ key: 'a' })).toEqual({ kind: 'none' });
  });

  it('turns Ctrl+] into the group separator 0x1D (ASCII GS; FNC1 in GS1 symbols)', () => {
    // ASCII: Ctrl with ] produces code 0x1D, "GS"; GS1 General Specifications: FNC1 as a
    // separator is transmitted as <GS>.
    expect(GROUP_SEPARATOR.charCodeAt(0)).toBe(0x1d);
    expect(scanKeyAction({ key: ']', ctrlKey: true })).toEqual({ kind: 'insert', text: '\u001d' });
    expect(scanKeyAction({ key: ']' })).toEqual({ kind: 'none' });
  });

  it('trims what the wedge adds but keeps GS inside the code', () => {
    expect(cleanScan('  TLC-4D7QX2MB9\r\n')).toBe('TLC-4D7QX2MB9');
    expect(cleanScan(`0109501101530003${'10'}LOT7${GROUP_SEPARATOR}17271231\t`)).toBe(
      `0109501101530003${'10'}LOT7${GROUP_SEPARATOR}17271231`,
    );
  });
});

describe('useScanner', () => {
  it('hands a GS1 element string typed with Ctrl+] to onScan, readable by the GS1 parser', async () => {
    const scans: string[] = [];
    const scanner = useScanner({
      onScan: (code) => {
        scans.push(code);
      },
    });
    scanner.value.value = '0109501101530003' + '10E2E-7';
    scanner.onKeydown({ key: ']', ctrlKey: true });
    scanner.value.value += '17271231';
    expect(await scanner.submit()).toBe(true);
    expect(scans).toHaveLength(1);
    // The raw form with GS reads as the bracketed one (GS1 General Specifications §7.8).
    const parsed = parseGs1(scans[0], new Date('2026-01-01T00:00:00Z'));
    expect(parsed).toMatchObject({ gtin: '09501101530003', lot: 'E2E-7', expiresOn: '2027-12-31' });
    expect(scanner.value.value).toBe('');
  });

  it('ignores an empty field and Enter while the previous scan is handled', async () => {
    let release: () => void = () => undefined;
    const scans: string[] = [];
    const scanner = useScanner({
      onScan: (code) => {
        scans.push(code);
        return new Promise<void>((resolve) => {
          release = resolve;
        });
      },
    });
    expect(await scanner.submit()).toBe(false);
    scanner.value.value = 'TLC-AAAAAAAA1';
    const first = scanner.submit();
    expect(scanner.busy.value).toBe(true);
    scanner.value.value = 'TLC-BBBBBBBB1';
    expect(await scanner.submit()).toBe(false);
    release();
    expect(await first).toBe(true);
    expect(scans).toEqual(['TLC-AAAAAAAA1']);
    expect(scanner.busy.value).toBe(false);
  });

  it('drops a double read of the same code but takes it again later', async () => {
    let t = 1000;
    const scans: string[] = [];
    const scanner = useScanner({
      onScan: (code) => {
        scans.push(code);
      },
      repeatMs: 800,
      clock: () => t,
    });
    scanner.value.value = 'TLC-4D7QX2MB9';
    await scanner.submit();
    t += 200;
    scanner.value.value = 'TLC-4D7QX2MB9';
    expect(await scanner.submit()).toBe(false);
    t += 1000;
    scanner.value.value = 'TLC-4D7QX2MB9';
    expect(await scanner.submit()).toBe(true);
    expect(scans).toHaveLength(2);
    expect(scanner.display(`a${GROUP_SEPARATOR}b`)).toBe('a⟨GS⟩b');
  });

  it('frees the field when onScan fails', async () => {
    const scanner = useScanner({
      onScan: () => {
        throw new Error('server down');
      },
    });
    scanner.value.value = 'X';
    await expect(scanner.submit()).rejects.toThrow('server down');
    expect(scanner.busy.value).toBe(false);
  });
});
