import { describe, expect, it } from 'vitest';
import { ROLES, type Role } from '../../shared/constants';
import { can, type Action } from '../../shared/permissions';
import { NAV_GROUPS, NAV_ITEMS, groupNavItems, visibleNavItems, type NavItem } from '@/navigation';
import { safeRedirect } from '@/router/redirect';

const everyRoute = () => true;
/** `can` as the session answers it for someone holding `roles` (from the one permission map). */
const canAs =
  (roles: Role[]) =>
  (...actions: Action[]) =>
    actions.some((a) => can(roles, a));
const labelsFor = (roles: Role[], exists: (name: string) => boolean = everyRoute) =>
  visibleNavItems(canAs(roles), exists).map((item) => item.label);

const FIXTURE: NavItem[] = [
  { to: 'home', label: 'Home', icon: 'home', group: 'start' },
  { to: 'station.work', label: 'Station', icon: 'x', group: 'floor', permission: 'steps.run' },
  { to: 'batches.list', label: 'Batches', icon: 'x', group: 'floor', permission: 'batches.create' },
  { to: 'cure.board', label: 'Cure', icon: 'x', group: 'floor', permission: ['steps.run', 'deviations.record'] },
  { to: 'lots.list', label: 'Lots', icon: 'x', group: 'oversight' },
  { to: 'users.list', label: 'Users', icon: 'x', group: 'admin', permission: 'users.manage' },
];
const fixtureLabels = (roles: Role[], exists: (name: string) => boolean = everyRoute) =>
  visibleNavItems(canAs(roles), exists, FIXTURE).map((item) => item.label);

describe('visibleNavItems', () => {
  it('keeps items open to everyone and those of a role the user holds, in order', () => {
    expect(fixtureLabels(['assembler'])).toEqual(['Home', 'Station', 'Batches', 'Cure', 'Lots']);
    expect(fixtureLabels(['quality'])).toEqual(['Home', 'Batches', 'Cure', 'Lots']);
    expect(fixtureLabels(['admin'])).toEqual(['Home', 'Lots', 'Users']);
    expect(fixtureLabels([])).toEqual(['Home', 'Lots']);
  });

  it('joins the menus of a person holding several roles, each item once', () => {
    expect(fixtureLabels(['assembler', 'quality', 'admin'])).toEqual(['Home', 'Station', 'Batches', 'Cure', 'Lots', 'Users']);
  });

  it('shows only items whose route is registered', () => {
    const registered = new Set(['home', 'batches.list']);
    expect(fixtureLabels(['assembler'], (name) => registered.has(name))).toEqual(['Home', 'Batches']);
    expect(fixtureLabels(['admin'], (name) => registered.has(name))).toEqual(['Home']);
  });

  it('groups items in drawer order and leaves empty groups out', () => {
    const grouped = groupNavItems(visibleNavItems(canAs(['quality']), everyRoute, FIXTURE));
    expect(grouped.map((entry) => entry.group.id)).toEqual(['start', 'floor', 'oversight']);
    expect(grouped[1].items.map((item) => item.label)).toEqual(['Batches', 'Cure']);
  });
});

describe('the real menu follows the product brief ("who uses it, and what each must get done")', () => {
  const menuOf = (role: Role) => labelsFor([role]);

  it('gives each role the areas of its job', () => {
    expect(menuOf('receiving')).toEqual(expect.arrayContaining(['Home', 'Receiving', 'Labels', 'Lots']));
    expect(menuOf('assembler')).toEqual(expect.arrayContaining(['Home', 'Station', 'Batches', 'Cure board', 'Final test', 'Lots']));
    expect(menuOf('quality')).toEqual(expect.arrayContaining(['Home', 'Batches', 'Cure board', 'Final test', 'Lots', 'Trace', 'Alerts']));
    expect(menuOf('purchasing')).toEqual(expect.arrayContaining(['Home', 'Lots', 'Alerts', 'Stock & expiry']));
    expect(menuOf('admin')).toEqual(
      expect.arrayContaining(['Home', 'Receiving', 'Lots', 'Alerts', 'Materials', 'Suppliers', 'Stations', 'Driver models', 'Users']),
    );
  });

  it('keeps administration and the station screen to their roles', () => {
    for (const role of ROLES.filter((r) => r !== 'admin')) {
      expect(menuOf(role)).not.toContain('Users');
      expect(menuOf(role)).not.toContain('Driver models');
    }
    for (const role of ROLES.filter((r) => r !== 'assembler')) expect(menuOf(role)).not.toContain('Station');
  });

  it('has unique, dotted route names and real groups', () => {
    const names = NAV_ITEMS.map((item) => item.to);
    expect(new Set(names).size).toBe(names.length);
    for (const name of names) expect(name).toMatch(/^[a-z]+(\.[a-z]+)*$/);
    const groupIds = new Set(NAV_GROUPS.map((group) => group.id));
    for (const item of NAV_ITEMS) expect(groupIds.has(item.group)).toBe(true);
  });
});

describe('safeRedirect (after sign-in, only paths inside this app are followed)', () => {
  it('follows an app path with its query', () => {
    expect(safeRedirect('/lots/7?tab=containers')).toBe('/lots/7?tab=containers');
    expect(safeRedirect(['/trace', '/other'])).toBe('/trace');
  });

  it('refuses other sites, odd values and the sign-in page itself', () => {
    for (const value of [
      '//evil.test/x',
      '/\\evil.test',
      'https://evil.test/',
      'lots',
      '',
      null,
      undefined,
      '/sign-in',
      '/sign-in?redirect=/x',
    ]) {
      expect(safeRedirect(value)).toBeNull();
    }
  });
});
