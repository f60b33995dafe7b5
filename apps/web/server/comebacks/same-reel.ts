import { sql, type SQL } from '@reelwright/db';
import { jobs } from '@reelwright/db/schema';

/**
 * Jobs of the same physical reel. Customers and their reels are recorded per shop, so a customer
 * who brings a reel back to another shop gets a new reel record there: besides the reel record
 * itself, any reel record in the network with the same maker, model and serial number counts
 * (compared ignoring case, spaces and punctuation). Without a serial number only the record itself
 * does: maker and model alone name thousands of reels.
 */
export function sameReelJobs(reelId: number): SQL {
  return sql`${jobs.reelId} in (
    select other.id
    from reels this
    join reels other on other.id = this.id or (
      nullif(regexp_replace(this.serial_number, '[^[:alnum:]]', '', 'g'), '') is not null
      and lower(other.maker) = lower(this.maker)
      and lower(other.model) = lower(this.model)
      and upper(regexp_replace(other.serial_number, '[^[:alnum:]]', '', 'g'))
        = upper(regexp_replace(this.serial_number, '[^[:alnum:]]', '', 'g'))
    )
    where this.id = ${reelId}
  )`;
}
