// Routes of the import, report and export features (issue 13), listed beside their own routers' schemas.
import type { RouteDoc } from './route-docs.js';

export const extraRouteDocs: RouteDoc[] = [];
