/** Joins class names, skipping the falsy ones, so conditional classes read as plain expressions. */
export function cn(...parts: Array<string | false | null | undefined>): string {
  return parts.filter(Boolean).join(' ');
}
