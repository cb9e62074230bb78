import "server-only";
/**
 * The weekly digest's use cases: its week and schedule (week), signed opt-out links and
 * opt-outs (opt-out), whom a stop link names (stop), what it says (content), sending it once per
 * member and week (send), the send log (log) and the campaign's schedule setting (schedule).
 */
export { digestDue, digestWeek } from "./week";
export { optIn, optOut, optOutToken, optOutsOf, readOptOutToken } from "./opt-out";
export { stopLinkTarget, type StopLinkTarget } from "./stop";
export { gatherDigest, previewDigest, renderDigest } from "./content";
export {
  MAX_ATTEMPTS,
  RETRY_DELAYS_MS,
  recipients,
  sendCampaignDigest,
  sendDueDigests,
  type SendSummary,
} from "./send";
export { sendLog } from "./log";
export { setSchedule } from "./schedule";
