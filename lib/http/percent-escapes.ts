/** Whether every percent-escape in a URL path decodes to UTF-8 (RFC 3986 §2.1, RFC 3629). */
export function percentEscapesValid(path: string): boolean {
  try {
    decodeURIComponent(path);
    return true;
  } catch {
    return false;
  }
}
