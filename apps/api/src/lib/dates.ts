// Calendar days as the API stores and compares them: ISO dates (YYYY-MM-DD) in UTC.
export const isoDay = (at: Date): string => at.toISOString().slice(0, 10);
