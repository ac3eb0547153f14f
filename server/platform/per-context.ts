/**
 * A feature's service, built the first time a context asks for it and then kept with that
 * context, so callers write `tanksService(ctx)` wherever they need it without building it anew.
 */
export function perContext<C extends object, T>(build: (ctx: C) => T): (ctx: C) => T {
  const built = new WeakMap<C, T>()
  return (ctx) => {
    if (!built.has(ctx)) built.set(ctx, build(ctx))
    return built.get(ctx)!
  }
}
