// What an answer says it was computed from (docs/design.md §6, last paragraph): one cap for every list.

/**
 * Longest list of work orders, tags, windows or element serials an answer gives as provenance. Longer
 * lists are cut to it and their full length given beside them (`workOrderCount`, `elementCount`) or in a
 * note, so an answer stays a readable size while any number on a screen can still be traced.
 */
export const PROVENANCE_CAP = 1000;

/** A list cut to PROVENANCE_CAP entries, with a note when it was cut. */
export function capped<T>(list: T[], what: string, notes: string[]): T[] {
  if (list.length <= PROVENANCE_CAP) return list;
  notes.push(`Provenance lists the first ${PROVENANCE_CAP} of ${list.length.toLocaleString('en')} ${what}.`);
  return list.slice(0, PROVENANCE_CAP);
}
