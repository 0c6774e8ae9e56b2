const UUID = /^[0-9a-f]{8}-[0-9a-f]{4}-[0-9a-f]{4}-[0-9a-f]{4}-[0-9a-f]{12}$/i;

/** Whether a URL segment can be a row id; anything else is a 404 before any query runs. */
export function isRowId(segment: string): boolean {
  return UUID.test(segment);
}
