export type ClassValue = string | false | null | undefined | 0;

/** Joins the class names that are set: `cn('px-2', active && 'bg-tide-700')`. */
export function cn(...classes: ClassValue[]): string {
  return classes.filter(Boolean).join(' ');
}
