import { describe, expect, it } from 'vitest';
import { ROLES, type Role } from '../../shared/constants';
import { NAV_GROUPS, NAV_ITEMS, groupNavItems, visibleNavItems } from '@/navigation';
import { safeRedirect } from '@/router/redirect';

const everyRoute = () => true;
const labelsFor = (roles: Role[], exists: (name: string) => boolean = everyRoute) =>
  visibleNavItems(roles, exists).map((item) => item.label);

describe('navigation per role (the product brief: who uses it, and what each must get done)', () => {
  it('gives each role its own menu when every area exists', () => {
    expect(labelsFor(['receiving'])).toEqual(['Home', 'Receiving', 'Labels', 'Lots']);
    expect(labelsFor(['assembler'])).toEqual(['Home', 'Station', 'Batches', 'Cure board', 'Final test', 'Lots']);
    expect(labelsFor(['quality'])).toEqual(['Home', 'Batches', 'Cure board', 'Final test', 'Lots', 'Trace', 'Alerts']);
    expect(labelsFor(['purchasing'])).toEqual(['Home', 'Lots', 'Alerts', 'Stock & expiry']);
    expect(labelsFor(['admin'])).toEqual([
      'Home', 'Receiving', 'Lots', 'Alerts', 'Materials', 'Suppliers', 'Stations', 'Driver models', 'Users',
    ]);
  });

  it('joins the menus of a person holding several roles, each item once', () => {
    const labels = labelsFor(['receiving', 'quality']);
    expect(labels).toEqual(['Home', 'Receiving', 'Labels', 'Batches', 'Cure board', 'Final test', 'Lots', 'Trace', 'Alerts']);
    expect(new Set(labels).size).toBe(labels.length);
  });

  it('shows only items whose route is registered', () => {
    const registered = new Set(['home', 'lots.list']);
    for (const role of ROLES) expect(labelsFor([role], (name) => registered.has(name))).toEqual(['Home', 'Lots']);
  });

  it('gives a user with no role only what everyone signed in sees', () => {
    expect(labelsFor([])).toEqual(['Home', 'Lots']);
  });

  it('has unique, dotted or single-word route names and real groups', () => {
    const names = NAV_ITEMS.map((item) => item.to);
    expect(new Set(names).size).toBe(names.length);
    for (const name of names) expect(name).toMatch(/^[a-z]+(\.[a-z]+)*$/);
    const groupIds = new Set(NAV_GROUPS.map((group) => group.id));
    for (const item of NAV_ITEMS) expect(groupIds.has(item.group)).toBe(true);
  });

  it('groups items in drawer order and leaves empty groups out', () => {
    const grouped = groupNavItems(visibleNavItems(['purchasing'], everyRoute));
    expect(grouped.map((entry) => entry.group.id)).toEqual(['start', 'oversight']);
    expect(grouped[1].items.map((item) => item.label)).toEqual(['Lots', 'Alerts', 'Stock & expiry']);
  });
});

describe('safeRedirect (after sign-in, only paths inside this app are followed)', () => {
  it('follows an app path with its query', () => {
    expect(safeRedirect('/lots/7?tab=containers')).toBe('/lots/7?tab=containers');
    expect(safeRedirect(['/trace', '/other'])).toBe('/trace');
  });

  it('refuses other sites, odd values and the sign-in page itself', () => {
    for (const value of ['//evil.test/x', '/\\evil.test', 'https://evil.test/', 'lots', '', null, undefined, '/sign-in', '/sign-in?redirect=/x']) {
      expect(safeRedirect(value)).toBeNull();
    }
  });
});
