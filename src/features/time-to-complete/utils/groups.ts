/** What a group key is about and its value: `crew=crew-a` → ["Crew", "crew-a"], `guided=yes` → ["Procedure open", "yes"]. */
export function describeGroup(key: string): { kind: string; value: string } {
  if (key === 'all') return { kind: 'All jobs', value: '' };
  const [kind, ...rest] = key.split('=');
  const value = rest.join('=');
  switch (kind) {
    case 'guided':
      return { kind: 'Written procedure', value: value === 'yes' ? 'followed' : 'not followed' };
    case 'crew':
      return { kind: 'Crew', value };
    case 'procedure':
      return { kind: 'Job', value };
    default:
      return { kind, value };
  }
}

/** Order of the group kinds in the table: all, guided, procedure, crew. */
export function groupOrder(key: string): number {
  if (key === 'all') return 0;
  if (key.startsWith('guided=')) return 1;
  if (key.startsWith('procedure=')) return 2;
  return 3;
}
