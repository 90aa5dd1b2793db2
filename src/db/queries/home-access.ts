import { and, eq } from 'drizzle-orm';
import { db } from '..';
import { homes } from '../schema';
import type { Scope } from '../../lib/server/authz';
import { homeInScope, isUuid } from './scope';

export interface HomeSummary { id: string; companyId: string; reference: string; addressLine: string; town: string; postcode: string }

/** A home the viewer may see, or null (another company's, another householder's, or no such home). */
export async function getHomeInScope(scope: Scope, homeId: string): Promise<HomeSummary | null> {
  if (!isUuid(homeId)) return null;
  const [row] = await db()
    .select({ id: homes.id, companyId: homes.companyId, reference: homes.reference, addressLine: homes.addressLine, town: homes.town, postcode: homes.postcode })
    .from(homes)
    .where(and(eq(homes.id, homeId), homeInScope(scope)));
  return row ?? null;
}

export const homeLabel = (h: Pick<HomeSummary, 'reference' | 'addressLine' | 'town'>): string => `${h.addressLine}, ${h.town} (${h.reference})`;
