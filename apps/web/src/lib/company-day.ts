// "Today" and the current month on the company's own clock (Settings → time zone), not the browser's or
// UTC: a foreman in Chicago at 19:00 on the 31st is still in this month. The zone comes with the caller
// (/api/me); the date is read now, so a page left open past midnight moves on with the company.

/** The company's calendar day as YYYY-MM-DD. */
export function companyToday(timeZone: string, at: Date = new Date()): string {
  return new Intl.DateTimeFormat('en-CA', { timeZone, year: 'numeric', month: '2-digit', day: '2-digit' }).format(at);
}

/** The company's current month as YYYY-MM. */
export const companyMonth = (timeZone: string, at: Date = new Date()): string => companyToday(timeZone, at).slice(0, 7);
