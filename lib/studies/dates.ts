/** Calendar arithmetic on site dates (YYYY-MM-DD), pure. */

/** The same day `months` later; a day the month lacks becomes its last day (31 Jan + 1 month → 28/29 Feb: common practice). */
export function addMonths(date: string, months: number): string {
  const [y, m, d] = date.split("-").map(Number);
  const monthIndex = y * 12 + (m - 1) + months;
  const year = Math.floor(monthIndex / 12);
  const month = (monthIndex % 12) + 1;
  const lastDay = new Date(Date.UTC(year, month, 0)).getUTCDate();
  return `${String(year).padStart(4, "0")}-${String(month).padStart(2, "0")}-${String(Math.min(d, lastDay)).padStart(2, "0")}`;
}
