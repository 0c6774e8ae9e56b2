export { notifyFlags, runUrl, type NotifyOptions, type NotifyResult } from "./notify-flags";
export { renderFlagEmail, ruleLabel, type AlertFlag, type FlagEmailInput } from "./flag-email";
