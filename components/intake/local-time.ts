/** The browser's local time as a datetime-local input wants it (YYYY-MM-DDTHH:mm). */
export function localInputValue(date: Date = new Date()): string {
  const d = new Date(date.getTime() - date.getTimezoneOffset() * 60_000);
  return d.toISOString().slice(0, 16);
}
