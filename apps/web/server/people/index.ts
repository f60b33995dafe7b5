export {
  getPerson,
  invitationAction,
  invitePerson,
  listPeople,
  updatePerson,
  type PersonDetail,
  type PersonHistoryEntry,
  type PersonRow,
  type PersonStatus,
} from './people';
export {
  changeOwnPassword,
  describeLink,
  linkGone,
  requestPasswordReset,
  setPasswordFromLink,
} from './account';
export { isCommonPassword } from './passwords';
export { LINK_LIFETIME_MS } from './links';
