// Plain lists of names the engine needs at run time, kept free of zod so the command-line bundle does not load it
// (zod's full API cost about 50 ms of every start); lib/contracts/report.ts builds its schemas from them.
export const LENGTH_UNITS = ["m", "ft"] as const;
export const PROFILE_MODELS = ["walsh-watterson-1987", "elliptical-crack", "linear", "parabolic", "flat-topped", "flexible"] as const;
export const TIP_END_SIDES = ["strike-start", "strike-end", "up-dip", "down-dip"] as const;
