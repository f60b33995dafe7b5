export { saveShopCalendar, shopCalendarView, type ShopCalendarView } from './calendar';
export {
  createRegion,
  listRegions,
  openShop,
  royaltyRates,
  updateRegion,
  updateShop,
  type RegionView,
} from './manage';
