import { describe, expect, it } from 'vitest';
import { ageText, percentText, probabilityText } from '@/components/quality/qualityText';
import { ACTION_OPTIONS, ENTITY_OPTIONS, auditActionText, entityText } from '../../shared/audit-words';
import { NAV_ITEMS } from '@/navigation';
import { rolesFor } from '../../shared/permissions';

describe('quality overview numbers in words', () => {
  it('percentages keep small rates readable and never show a raw fraction', () => {
    expect(percentText(0.016)).toBe('1.60 %');
    expect(percentText(0.0875)).toBe('8.75 %');
    expect(percentText(0.00417)).toBe('0.417 %');
    expect(percentText(0)).toBe('0.00 %');
    expect(percentText(0.5)).toBe('50.0 %');
    expect(percentText(null)).toBe('—');
  });

  it('p- and q-values: 3 significant digits, tiny ones as "< 0.0001"', () => {
    expect(probabilityText(0.000346)).toBe('0.000346');
    expect(probabilityText(0.05)).toBe('0.05');
    expect(probabilityText(1)).toBe('1');
    expect(probabilityText(0.87654)).toBe('0.877');
    expect(probabilityText(1e-9)).toBe('< 0.0001');
  });

  it('ages in hours and days', () => {
    expect(ageText(0.5)).toBe('under an hour');
    expect(ageText(5.9)).toBe('5 h');
    expect(ageText(24)).toBe('1 day');
    expect(ageText(52)).toBe('2 days 4 h');
  });
});

describe('audit page words', () => {
  it('names actions and record types in words, unknown ones split into words', () => {
    expect(auditActionText('lot.status')).toBe('Status changed');
    expect(auditActionText('baseline.override')).toBe('Baseline failure rate overridden');
    expect(auditActionText('widget.do_thing')).toBe('Do thing');
    expect(entityText('build_batch')).toBe('Build batch');
    expect(entityText('some_new_thing')).toBe('Some new thing');
    for (const o of [...ACTION_OPTIONS, ...ENTITY_OPTIONS]) expect(o.label).not.toMatch(/[._]/);
  });

  it('the menu offers the audit trail and quality overview to quality and admin only, as the permission map says', () => {
    const audit = NAV_ITEMS.find((i) => i.to === 'audit.list');
    const quality = NAV_ITEMS.find((i) => i.to === 'quality.overview');
    expect(audit?.permission).toBe('audit.read');
    expect(quality?.permission).toBe('quality.overview');
    expect([...rolesFor('audit.read')].sort()).toEqual(['admin', 'quality']);
    expect([...rolesFor('quality.overview')].sort()).toEqual(['admin', 'quality']);
  });
});
