import type { Access } from '../../shared/permissions.js'

export interface RegisteredRoute {
  method: string
  path: string
  /** what the route's guard declares; undefined when the route has no guard */
  access: Access | undefined
}

interface Layer {
  rawPath?: string
  route?: { path: string; stack: { method?: string; handle: { access?: Access } }[] }
  handle: { stack?: Layer[] }
}

/** Every route registered in the Express app, read from its router stack (not from a hand-written list). */
export function listRoutes(app: object): RegisteredRoute[] {
  const found: RegisteredRoute[] = []
  const walk = (stack: Layer[], prefix: string) => {
    for (const layer of stack) {
      if (layer.route) {
        const access = layer.route.stack.find((l) => l.handle.access)?.handle.access
        const methods = new Set(layer.route.stack.map((l) => l.method).filter(Boolean) as string[])
        for (const method of methods) found.push({ method: method.toUpperCase(), path: prefix + layer.route.path, access })
      } else if (layer.handle.stack) {
        const mount = typeof layer.rawPath === 'string' && layer.rawPath !== '/' ? layer.rawPath : ''
        walk(layer.handle.stack, prefix + mount)
      }
    }
  }
  walk((app as unknown as { router: { stack: Layer[] } }).router.stack, '')
  return found
}
