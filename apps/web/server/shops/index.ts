export { saveShopCalendar, shopCalendarView, type ShopCalendarView } from './calendar';
export {
  createRegion,
  listRegions,
  openShop,
  updateRegion,
  updateShop,
  type RegionView,
} from './manage';
