// The sentence behind each null-reason code. Kept apart from stats.ts so the client can show them
// without loading jstat.
import type { NullReason } from '#shared/schemas/answer.ts';

export const nullReasonMessages: Record<NullReason, string> = {
  'no-data': 'There is no data in the window.',
  'no-failures': 'No failures in the window, so there is no mean time between failures or to restoration.',
  'no-events': 'Every life is censored (no life-ending event), so no lifetime distribution can be fitted.',
  'no-operating-time': 'The asset did not operate in the window.',
  'no-repairs': 'No repair with both a start and a completion time.',
  'no-time': 'Up time and down time are both zero.',
  'too-few-values': 'At least two values are needed.',
  'too-few-events': 'At least two life-ending events at different ages are needed.',
  'shape-diverges':
    'Every life-ending event happened at the longest age observed, so the Weibull shape grows without bound (no finite fit).',
  'survival-zero': 'The survival estimate has reached zero; its standard error and log-scale bounds are undefined.',
  'not-reached': 'The survival curve (or its confidence limit) never falls to one half.',
  unbounded: 'The likelihood-ratio interval does not close within the searched range.',
  'no-jobs': 'No jobs in this group.',
  'no-fit': 'No Weibull fit is available for this group.',
};
