/** Every API route of an Express app as "METHOD /path", read from its router stacks (Express 5 layers). */
import type { Express } from 'express';

interface Layer {
  rawPath?: string;
  route?: { path: string; methods: Record<string, boolean> };
  handle: { stack?: Layer[] };
}

export function listRoutes(app: Express): string[] {
  const out: string[] = [];
  const walk = (stack: Layer[], prefix: string) => {
    for (const layer of stack) {
      if (layer.route) {
        for (const method of Object.keys(layer.route.methods)) out.push(`${method.toUpperCase()} ${prefix}${layer.route.path}`);
      } else if (layer.handle.stack) {
        walk(layer.handle.stack, prefix + (layer.rawPath && layer.rawPath !== '/' ? layer.rawPath : ''));
      }
    }
  };
  walk((app as unknown as { router: { stack: Layer[] } }).router.stack, '');
  return [...new Set(out)].filter((r) => r.includes(' /api/')).sort();
}
