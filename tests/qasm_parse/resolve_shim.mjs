// qasm-ts 2.x ships ES modules that import siblings without the ".js" extension, which Node 20's
// resolver refuses; retry such relative imports with ".js" (or "/index.js").
export async function resolve(specifier, context, next) {
  try {
    return await next(specifier, context);
  } catch (e) {
    if (e.code !== 'ERR_MODULE_NOT_FOUND' || !(specifier.startsWith('.') || specifier.startsWith('/'))) throw e;
    try {
      return await next(specifier + '.js', context);
    } catch {
      return next(specifier + '/index.js', context);
    }
  }
}
