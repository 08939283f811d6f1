/** The common-practice minimum area ratio (IPC-7525 as quoted in trade articles, REFERENCE-FACTS §e). */
export const COMMON_PRACTICE_MIN_AREA_RATIO = 0.66;
