// A one-glance summary of an audit event's details for the table; the full JSON stays one click away.

const MAX_PARTS = 4;

function show(value: unknown): string {
  if (value === null || value === undefined || value === '') return '—';
  if (typeof value === 'string') return value.length > 60 ? `${value.slice(0, 57)}…` : value;
  if (typeof value === 'number' || typeof value === 'boolean') return String(value);
  return Array.isArray(value) ? `${value.length} items` : '{…}';
}

function isRecord(value: unknown): value is Record<string, unknown> {
  return typeof value === 'object' && value !== null && !Array.isArray(value);
}

/** e.g. ["name: Old name → New name", "reason: merged two sites"]. */
export function describeDetails(details: Record<string, unknown>): string[] {
  const parts: string[] = [];
  const { changes, reason, from, to, ...rest } = details;
  // A state change recorded as { from, to } reads as one transition.
  if (from !== undefined && to !== undefined && !isRecord(from) && !isRecord(to))
    parts.push(`${show(from)} → ${show(to)}`);
  else Object.assign(rest, from !== undefined ? { from } : {}, to !== undefined ? { to } : {});
  if (isRecord(changes)) {
    for (const [field, change] of Object.entries(changes)) {
      if (isRecord(change) && ('from' in change || 'to' in change)) {
        parts.push(`${field}: ${show(change.from)} → ${show(change.to)}`);
      } else {
        parts.push(`${field} changed`);
      }
    }
  }
  for (const [key, value] of Object.entries(rest)) {
    if (parts.length >= MAX_PARTS) break;
    if (value === null || value === undefined || isRecord(value)) continue;
    parts.push(`${key}: ${show(value)}`);
  }
  if (typeof reason === 'string' && reason) parts.push(`reason: ${show(reason)}`);
  return parts.slice(0, MAX_PARTS + 1);
}
