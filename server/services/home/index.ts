import { db } from '../../db/client';
import { config } from '../../config';
import { can } from '../../../shared/permissions';
import type { HomeFigures, HomeQuery } from '../../../shared/schemas/home';
import type { Actor } from '../auth/actor';
import { cureBoard } from '../cure';
import { readSetting } from '../settings';
import { todayFigures } from '../stock';
import { adminFigures } from './admin';
import { plantDay } from './day';
import { qualityFigures } from './quality';
import { receivingFigures } from './receiving';
import { batchAtStation, curesEndingSoon, stationOf } from './station';

async function assemblerFigures(actor: Actor, query: HomeQuery, now: Date): Promise<NonNullable<HomeFigures['assembler']>> {
  const [station, board, withinHours, shown] = await Promise.all([
    stationOf(db, actor, query.stationId),
    cureBoard({}, now),
    readSetting('homeCureSoonHours'),
    readSetting('homeCureSoonShown'),
  ]);
  const found = station ? await batchAtStation(db, station) : null;
  let batch: NonNullable<HomeFigures['assembler']>['batch'] = null;
  if (found) {
    const { stepRunId, ...rest } = found;
    // A finished step's cure as the cure board recomputes it from the readings (else as computed at finish).
    const onBoard = stepRunId ? board.items.find((i) => i.stepRunId === stepRunId) : undefined;
    batch = { ...rest, cureCompleteAt: onBoard ? onBoard.cureCompleteAt : rest.cureCompleteAt };
  }
  return { station, batch, curesEndingSoon: curesEndingSoon(board.items, now, withinHours, shown) };
}

/**
 * GET /api/home: the figures of the caller's day, one section per role they hold, each only
 * when the permission map gives them its `home.<role>` action. Every figure is read live.
 */
export async function homeFigures(actor: Actor, query: HomeQuery, now = new Date()): Promise<HomeFigures> {
  const day = plantDay(now);
  const [receiving, assembler, quality, purchasing, admin] = await Promise.all([
    can(actor.roles, 'home.receiving') ? receivingFigures(db, day) : undefined,
    can(actor.roles, 'home.assembler') ? assemblerFigures(actor, query, now) : undefined,
    can(actor.roles, 'home.quality') ? qualityFigures(db, actor, day) : undefined,
    can(actor.roles, 'home.purchasing') ? todayFigures(now) : undefined,
    can(actor.roles, 'home.admin') ? adminFigures(db) : undefined,
  ]);
  return {
    now: now.toISOString(),
    zone: config.plantZone,
    day: { date: day.date, start: day.start.toISOString(), end: day.end.toISOString() },
    ...(receiving ? { receiving } : {}),
    ...(assembler ? { assembler } : {}),
    ...(quality ? { quality } : {}),
    ...(purchasing ? { purchasing } : {}),
    ...(admin ? { admin } : {}),
  };
}
