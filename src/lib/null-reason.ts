import { nullReasonMessages } from '#shared/kpi/null-reasons.ts';
import type { NullReason } from '#shared/schemas/answer.ts';

/** The sentence for a KPI's null reason code (shared/kpi/stats.ts), or the code itself when unknown. */
export function nullReasonText(reason: string | null | undefined): string | undefined {
  if (!reason) return undefined;
  return (nullReasonMessages as Record<string, string>)[reason as NullReason] ?? reason;
}
