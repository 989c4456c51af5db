/** The service's named ephemeris sets (EPHEMERIS_DIR, loaded and checked at start-up): what a problem may choose. */
import { ephemerisSetsResponseSchema } from '../../contract/ephemeris-sets.ts';
import type { AppDeps } from '../deps.ts';
import type { ApiRoutes } from '../route-table.ts';

const READERS = ['submitter', 'reviewer', 'auditor'] as const;

export function ephemerisRoutes(routes: ApiRoutes, deps: AppDeps): void {
  routes.add({
    method: 'get', path: '/v1/ephemerides', tags: ['ephemerides'], roles: [...READERS],
    summary: 'List the named ephemeris sets a problem may choose (forceModel.ephemerisSet)',
    description: 'Each set is a folder of CCSDS OEM files under the service\'s EPHEMERIS_DIR, read and checked at start-up: '
      + 'for each file its name, SHA-256 and the bodies it tabulates with their spans (TDB and UTC). Bodies no file of '
      + 'the chosen set tabulates come from the built-in series; a problem naming no set uses the built-in series throughout.',
    responses: { 200: { description: 'The sets, by name', schema: ephemerisSetsResponseSchema } },
  }, (_req, res) => {
    res.json({ default: 'built-in', sets: [...deps.ephemerisSets.values()].map((s) => s.listing) });
  });
}
