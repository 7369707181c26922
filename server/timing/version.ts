/**
 * Engine version stamped on every result, so a margin report names the method that
 * produced it. Bump the minor version when a result changes for the same input.
 */
export const ENGINE_VERSION = '1.1.0'
