// Words of the sentences Osmia writes (KPI notes, messages), shared by the API, the CLI and the pages.

/** "1 work order", "3 work orders": a count with the noun that agrees with it. */
export function countOf(n: number, one: string, many: string): string {
  return `${n} ${n === 1 ? one : many}`;
}

/** The verb that agrees with a count: has/have, is/are, was/were. */
export function agree(n: number, one: string, many: string): string {
  return n === 1 ? one : many;
}
