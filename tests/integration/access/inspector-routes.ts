// Access entries for the inspector's pages and route handlers (see routes.ts for the helpers).
import type { RouteEntry } from "./routes";

export const inspectorRoutes: RouteEntry[] = [];
