// Safety cautions shown beside every procedure, cleaning or replacement recommendation (docs/design.md §9).
// One list, reused by every recommendation in the app, so the wording cannot drift between the
// dashboard, the workbooks, the digest and the CLI. Our own wording; the last line always defers
// to the plant's own rules, because Osmia cannot know a plant's equipment or its hazards.

/** Isolating and depressurizing before a pressure vessel, pipe or housing is opened. */
export const isolateAndDepressurizeCaution =
  'Isolate the train and release all pressure (feed, concentrate and permeate sides) before opening a pressure vessel, ' +
  'housing or pipe; confirm zero pressure on a gauge, and expect trapped water and stored energy.';

/** Lock-out/tag-out of the pumps that could restart while people work on the train. */
export const lockOutTagOutCaution =
  'Lock out and tag out the high-pressure pump, the feed and booster pumps and the cleaning pump before work starts; ' +
  'verify that they cannot be started.';

/** Personal protective equipment and handling of cleaning chemicals. */
export const chemicalHandlingCaution =
  'Cleaning chemicals (acids, caustic, biocides, detergents) burn skin and eyes: wear the protective equipment their ' +
  'safety data sheets require (eye and face protection, chemical gloves, apron), never mix acid and alkaline ' +
  'solutions, add chemicals to water rather than water to chemicals, and neutralize and dispose of spent solution ' +
  'as permitted.';

/** Osmia's advice never overrides the plant's own rules. */
export const deferToPracticeCaution =
  "These notes do not replace the plant's procedures, the membrane element maker's instructions, local codes and " +
  'licensed practice; where they differ, follow those.';

/** Every caution, in the order they are shown: the default list for any maintenance recommendation. */
export const maintenanceCautions: readonly string[] = [
  isolateAndDepressurizeCaution,
  lockOutTagOutCaution,
  chemicalHandlingCaution,
  deferToPracticeCaution,
];

/** Cautions for a clean-in-place recommendation (same as the full list: a clean opens circuits and uses chemicals). */
export const cleaningCautions: readonly string[] = maintenanceCautions;

/** Cautions for opening a vessel to inspect, probe or replace elements (no cleaning chemicals involved). */
export const vesselWorkCautions: readonly string[] = [
  isolateAndDepressurizeCaution,
  lockOutTagOutCaution,
  deferToPracticeCaution,
];
