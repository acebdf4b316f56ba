/**
 * Every ArrayBuffer under a plain value (objects, arrays, typed arrays), so a result can be posted
 * between threads without copying. Shared buffers are left out: they are shared, not moved.
 */
export function collectTransferables(
  value: unknown,
  found: Set<ArrayBuffer> = new Set(),
  depth = 0,
): ArrayBuffer[] {
  if (depth > 8 || value === null || typeof value !== 'object') return [...found];
  if (ArrayBuffer.isView(value)) {
    if (value.buffer instanceof ArrayBuffer && value.buffer.byteLength > 0) found.add(value.buffer);
  } else if (Array.isArray(value)) {
    for (const item of value) collectTransferables(item, found, depth + 1);
  } else {
    for (const item of Object.values(value)) collectTransferables(item, found, depth + 1);
  }
  return [...found];
}
