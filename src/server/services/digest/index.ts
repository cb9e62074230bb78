import "server-only";
/**
 * The weekly digest's use cases: its week and schedule (week), signed opt-out links and
 * opt-outs (opt-out), whom a stop link names (stop), what it says (content), sending it once per
 * member and week (send), the send log (log) and the campaign's schedule setting (schedule).
 */
export { digestDue, digestWeek } from "./week";
export { OPT_OUT_LINK_DAYS, optIn, optOut, optOutToken, optOutsOf, readOptOutToken } from "./opt-out";
export { stopDigestByLink, stopLinkTarget, type StopLinkTarget } from "./stop";
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
