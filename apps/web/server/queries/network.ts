// Fair comparison of shops: the network view, one shop's page, and their monthly trends.
export { networkComparison } from './network/comparison';
export { shopMetrics } from './network/shop';
export { networkTrends, shopTrends } from './network/trends';
export { networkSettingsUsed, visibleShop, type QueryContext } from './network/context';
export type * from './network/types';
