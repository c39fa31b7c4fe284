// The read side of the registry: settled effects, one page at a time or one by one with its provenance.
import type { Knex } from 'knex';
import { pageOf } from '../../shared/schemas/common.js';
import type { SettledEffectDetail, SettledEffectPage } from '../../shared/schemas/registry.js';
import { NotFoundError } from '../lib/errors.js';
import { countSettledEffects, findEffect, getSettledEffect, querySettledEffects, type SettledEffectFilters, type SettledEffectPaging } from '../repositories/effects.js';
import { currentRegistryVersion } from '../repositories/registry-version.js';

export async function listSettledEffects(db: Knex, filters: SettledEffectFilters, paging: SettledEffectPaging): Promise<SettledEffectPage> {
  const [items, total, registryVersion] = await Promise.all([querySettledEffects(db, filters, paging), countSettledEffects(db, filters), currentRegistryVersion(db)]);
  return { ...pageOf(items, total, paging), registryVersion };
}

export async function settledEffectDetail(db: Knex, id: number): Promise<SettledEffectDetail> {
  const effect = await getSettledEffect(db, id);
  if (!effect) throw new NotFoundError(`No settled effect ${id}.`);
  const row = (await findEffect(db, id))!;
  return { effect: { ...effect, form: row.report_form, reported: row.reported, page: row.page, locator: row.locator, quote: row.quote, version: row.version } };
}
