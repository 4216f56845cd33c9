import type { Express } from 'express';
import type { RouteSpec } from '@/sync-server/src/routes/access-table';

interface StackLayer {
  route?: { path: string; methods: Record<string, boolean> };
}

// The web app's shell, the one route outside /api; it never answers /api paths.
const NON_API_ROUTES = new Set(['get /{*splat}']);

/** Routes Express has registered that the access table does not declare. */
export function undeclaredRoutes(app: Express, table: readonly RouteSpec[]): string[] {
  const declared = new Set(table.map((r) => `${r.method} ${r.path}`));
  const stack = (app as unknown as { router: { stack: StackLayer[] } }).router.stack;
  const registered = stack.flatMap((layer) =>
    layer.route ? Object.keys(layer.route.methods).map((m) => `${m} ${layer.route!.path}`) : [],
  );
  return registered.filter((r) => !declared.has(r) && !NON_API_ROUTES.has(r));
}
