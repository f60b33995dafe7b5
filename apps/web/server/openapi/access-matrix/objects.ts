import type { Principal } from '~/server/principal';
import type { World } from './world';

// Which object each case names. For every kind of id, "own" is an id in the caller's scope,
// "other" one of the same kind outside it and "missing" an id no row has:
//
// - shop: own = the first shop in scope (the lead's or technician's shop, the manager's region's
//   first, any for the owner, the shops of the auditor's rounds); other = the first shop outside.
// - region: the region of the own shop; other = a region with no shop in scope.
// - job, part, photo: per shop, its open job in the earliest state (checked in, on the bench,
//   waiting for parts, ready: Fennel Cove's season has ended), with a part line and a photo added;
//   own / other = that job of the own / the first out-of-scope shop. Missing parts and photos
//   are asked for on the own job.
// - return job (linking a comeback by hand): an open job whose reel was collected before.
// - round, sample, sample photo: for the auditor, rounds assigned to them are own and the second
//   auditor's are other; for a shop lead, their shop's decided rounds (an open round's sample is
//   not shown to the shop); for everyone else, rounds of shops in scope. A sample is the round's
//   first sampled job, with a photo added; missing samples are asked for in the own round.
// - comeback, corrective action, reminder batch: one of the own / out-of-scope shop.
// - person: a technician of the own / the first out-of-scope shop (a regional manager sees the
//   people of their region's shops).
// - month: months are closed for the whole network, so there is no other; 2026-11 is own.
//
// The owner sees the whole network: no "other" exists for them and those cases are left out.

export const MISSING_ID = 987_654;

export type Which = 'own' | 'other' | 'missing';
export type Kind =
  | 'shop'
  | 'region'
  | 'job'
  | 'returnJob'
  | 'part'
  | 'photo'
  | 'round'
  | 'sample'
  | 'samplePhoto'
  | 'comeback'
  | 'action'
  | 'batch'
  | 'person'
  | 'month';

/** The ids of the chosen object, by the path parameter names the routes use. */
export type Ref = Record<string, string>;

/** The shops a caller's scope reaches; the signed-out caller is given the owner's view. */
export function shopsInScope(world: World, who: Principal | null): Set<number> {
  const scope = who?.scope ?? { kind: 'network' as const };
  const ids = world.shops
    .filter((s) => {
      if (scope.kind === 'network') return true;
      if (scope.kind === 'region') return s.regionId === scope.regionId;
      if (scope.kind === 'shop') return s.id === scope.shopId;
      return world.rounds.some((r) => r.shopId === s.id && r.auditorId === who!.id);
    })
    .map((s) => s.id);
  return new Set(ids);
}

function pick<T extends { shopId: number }>(items: T[], inScope: Set<number>, which: Which) {
  return items.find((i) => (which === 'own' ? inScope.has(i.shopId) : !inScope.has(i.shopId)));
}

const str = (n: number) => String(n);

/** The object of a kind for a caller, or undefined when none exists (the owner's "other"). */
export function chooseObject(
  world: World,
  who: Principal | null,
  kind: Kind,
  which: Which,
): Ref | undefined {
  const inScope = shopsInScope(world, who);
  const m = which === 'missing';
  const byShop = <T extends { shopId: number; id: number }>(items: T[]) => {
    const found = pick(items, inScope, which === 'missing' ? 'own' : which);
    return found && { ...found, id: m ? MISSING_ID : found.id };
  };
  switch (kind) {
    case 'shop': {
      const shop = pick(
        world.shops.map((s) => ({ ...s, shopId: s.id })),
        inScope,
        m ? 'own' : which,
      );
      return shop && { id: str(m ? MISSING_ID : shop.id) };
    }
    case 'region': {
      const own = new Set(world.shops.filter((s) => inScope.has(s.id)).map((s) => s.regionId));
      const region = world.regionIds.find((r) => (which === 'other' ? !own.has(r) : own.has(r)));
      return region === undefined ? undefined : { id: str(m ? MISSING_ID : region) };
    }
    case 'job':
    case 'returnJob': {
      const job = kind === 'job' ? byShop(world.openJobs) : byShop(world.returnJobs);
      return job && { id: str(job.id) };
    }
    case 'part':
    case 'photo': {
      const job = pick(world.openJobs, inScope, m ? 'own' : which);
      if (!job) return undefined;
      const child = m ? MISSING_ID : kind === 'part' ? job.partId : job.photoId;
      return { id: str(job.id), [kind === 'part' ? 'partId' : 'photoId']: str(child) };
    }
    case 'round':
    case 'sample':
    case 'samplePhoto': {
      const mine = (r: World['rounds'][number]) =>
        who?.role === 'auditor'
          ? r.auditorId === who.id
          : inScope.has(r.shopId) && (who?.role !== 'shop_lead' || r.decided);
      const round = world.rounds.find((r) => (which === 'other' ? !mine(r) : mine(r)));
      if (!round) return undefined;
      if (kind === 'round') return { id: str(m ? MISSING_ID : round.id) };
      if (kind === 'sample') return { id: str(round.id), jobId: str(m ? MISSING_ID : round.jobId) };
      return {
        id: str(round.id),
        jobId: str(round.jobId),
        photoId: str(m ? MISSING_ID : round.photoId),
      };
    }
    case 'comeback':
    case 'action':
    case 'batch': {
      const list =
        kind === 'comeback' ? world.comebacks : kind === 'action' ? world.actions : world.batches;
      const item = byShop(list);
      return item && { id: str(item.id) };
    }
    case 'person': {
      const person = byShop(world.technicians);
      return person && { id: str(person.id) };
    }
    case 'month':
      return which === 'own' ? { month: '2026-11' } : undefined;
  }
}
