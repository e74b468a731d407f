// Request schemas of the continuity log: they live in packages/rules (continuity-log.ts) so the API and
// the web parse with one schema; re-exported here for the router and the service.
export { gridQuery, gridSaveInput, gridWeldersQuery, monthText, reviewInput, type GridSaveInput } from '@beadroll/rules';
