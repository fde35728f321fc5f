// The provenance cap lives with the answer builders in shared/kpi/provenance.ts; services that still
// assemble their own provenance import it from here.
export { PROVENANCE_CAP, capped } from '#shared/kpi/provenance.ts';
