// Words for stored codes, shared by the server and the islands (no dependencies, so islands stay small).
// Heat-source kinds and their words live with their capabilities in src/lib/heat-sources.ts.
export { heatSourceKinds as heatSourceValues, heatSourceLabels } from '../heat-sources';

export const statusLabels = { offline: 'Not reporting', attention: 'Needs attention', ok: 'Fine' } as const;
