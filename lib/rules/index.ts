/**
 * Zoneward's pure rules: grading against published minimums, report validity, due dates and
 * compliance states, the notice plan, suspicious-report signals, the yearly summary, units.
 * No I/O and no clock: "today" is always a parameter, so the same code runs in the browser
 * (live grading on the form) and on the server (the record).
 */
export * from './errors';
export * from './units';
export * from './dates';
export * from './field-test';
export * from './rule-sets';
export * from './grading';
export * from './validity';
export * from './hazard';
export * from './compliance';
export * from './notices';
export * from './signals';
export * from './summary';
