/** Joins class names, skipping empty ones: cn('a', cond && 'b', undefined) → "a b" or "a". */
export function cn(...classes: Array<string | false | null | undefined>): string {
  return classes.filter(Boolean).join(' ');
}
