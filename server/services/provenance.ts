// The provenance cap lives with the report builders in shared/kpi/provenance.ts; re-exported here for the
// services that still apply it themselves.
export { PROVENANCE_CAP, capped } from '#shared/kpi/provenance.ts';
