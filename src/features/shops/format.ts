/** "America/New_York" reads better as "America/New York" on a card; the value itself is unchanged. */
export function formatTimeZone(timeZone: string): string {
  return timeZone.replace(/_/g, ' ');
}

export function pluralize(count: number, one: string, many: string): string {
  return `${count} ${count === 1 ? one : many}`;
}
