/** Plain words for internal values (shared/words.ts): every listed value has words, none reads as the value. */
import { describe, expect, it } from 'vitest';
import {
  ALERT_KINDS,
  ALERT_SEVERITIES,
  ALERT_STATES,
  BATCH_STATUSES,
  CONTAINER_STATUSES,
  DRIVER_STATUSES,
  LOT_STATUSES,
  MATERIAL_KINDS,
  MIX_STATUSES,
  ROLES,
  STORAGE_CLASSES,
} from '../../shared/constants';
import {
  alertKindWords,
  alertSeverityWords,
  alertStateWords,
  batchStatusWords,
  containerStatusWords,
  driverStatusWords,
  humanize,
  lotStatusWords,
  materialKindWords,
  mixStatusWords,
  roleWord,
  roleWords,
  stationKindWords,
  storageClassWords,
} from '../../shared/words';

const lists: [string, readonly string[], (v: string) => string][] = [
  ['roles', ROLES, roleWord],
  ['material kinds', MATERIAL_KINDS, materialKindWords],
  ['storage classes', STORAGE_CLASSES, storageClassWords],
  ['lot statuses', LOT_STATUSES, lotStatusWords],
  ['container statuses', CONTAINER_STATUSES, containerStatusWords],
  ['mix statuses', MIX_STATUSES, mixStatusWords],
  ['batch statuses', BATCH_STATUSES, batchStatusWords],
  ['driver statuses', DRIVER_STATUSES, driverStatusWords],
  ['alert kinds', ALERT_KINDS, alertKindWords],
  ['alert severities', ALERT_SEVERITIES, alertSeverityWords],
  ['alert states', ALERT_STATES, alertStateWords],
];

describe('plain words', () => {
  it.each(lists)('every one of the %s reads as words starting with a capital, never with an underscore', (_name, values, words) => {
    for (const value of values) {
      const text = words(value);
      expect(text, value).not.toContain('_');
      expect(text[0], value).toBe(text[0].toUpperCase());
    }
  });

  it('says the examples of issue 7 as people do', () => {
    expect(materialKindWords('dust_cap')).toBe('Dust cap');
    expect(stationKindWords('magnet_assembly')).toBe('Magnet assembly');
    expect(lotStatusWords('on_hold')).toBe('On hold');
  });

  it('reads a value it does not list (a station kind an administrator typed) as its words', () => {
    expect(stationKindWords('voice_coil_winding')).toBe('Voice coil winding');
    expect(stationKindWords('dust-cap glue')).toBe('Dust-cap glue');
    expect(humanize('')).toBe('');
    expect(stationKindWords(null)).toBe('');
  });

  it('lists roles as a sentence', () => {
    expect(roleWords(['quality'])).toBe('Quality');
    expect(roleWords(['quality', 'admin'])).toBe('Quality or Administrator');
    expect(roleWords(['receiving', 'assembler', 'quality'])).toBe('Receiving, Assembler or Quality');
  });
});
