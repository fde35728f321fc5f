// Turns a zod issue list (from the shared schema on the client, or from a 400 answer of the API)
// into one message per top-level field.

interface Issue {
  path: readonly PropertyKey[];
  message: string;
}

function sentence(message: string): string {
  const trimmed = message.trim();
  const capital = trimmed.charAt(0).toUpperCase() + trimmed.slice(1);
  return /[.!?]$/.test(capital) ? capital : `${capital}.`;
}

/** Field name → its first issue, as a sentence; issues with no path are left out. */
export function fieldErrorsFrom(issues: readonly Issue[]): Record<string, string> {
  const out: Record<string, string> = {};
  for (const issue of issues) {
    const field = issue.path.length > 0 ? String(issue.path[0]) : '';
    if (field && !(field in out)) out[field] = sentence(issue.message);
  }
  return out;
}
