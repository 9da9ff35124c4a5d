// The whole table: each area of the product keeps its entries in its own file.
import { feesRoutes } from "./fees-routes";
import { inspectorRoutes } from "./inspector-routes";
import { ownerRoutes } from "./owner-routes";
import type { RouteEntry } from "./routes";
import { foundationRoutes } from "./routes";
import { testerRoutes } from "./tester-routes";

export const allRoutes: RouteEntry[] = [...foundationRoutes, ...testerRoutes, ...inspectorRoutes, ...ownerRoutes, ...feesRoutes];
