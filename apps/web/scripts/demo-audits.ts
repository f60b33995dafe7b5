// Adds twelve months of audit rounds to a freshly seeded demo network (none when any round
// exists). Run by scripts/demo.sh after the seed: pnpm --filter @reelwright/web demo:audits
import { addDemoAuditHistory } from '../server/audits/demo-history';
import { database } from '../server/db';

const today = new Date().toISOString().slice(0, 10);
const result = await addDemoAuditHistory({ today, months: 12 });
if (result)
  console.log(
    `› audit history: ${result.rounds} rounds planned and scored (${result.samples} sampled jobs, ${result.rejected} lots rejected)`,
  );
await (await database()).close();
