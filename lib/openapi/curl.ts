import { UPLOAD_FIELD_EXAMPLES } from "./examples";

// curl lines for the API page and the README, built from the document itself so they follow it.

interface OperationLike {
  security?: Record<string, string[]>[];
  requestBody?: { content?: Record<string, { example?: unknown }> };
  responses?: Record<string, unknown>;
}

/** `{buildId}` → `$BUILD_ID`: a shell variable the reader sets. */
function shellVariable(name: string): string {
  return `$${name.replace(/([a-z0-9])([A-Z])/g, "$1_$2").toUpperCase()}`;
}

function singleQuoted(text: string): string {
  return `'${text.replace(/'/g, `'\\''`)}'`;
}

/**
 * A curl command for one operation of the document, split over lines with backslashes.
 * @param path - the path as the document writes it, e.g. /api/v1/runs/{runId}
 * @param method - lower-case HTTP method
 * @param operation - the operation object from the document
 * @param baseUrl - where the app runs; the token is read from $TANKBOOK_TOKEN
 * @returns the command, ready to paste after setting the variables it names
 */
export function curlExample(path: string, method: string, operation: OperationLike, baseUrl = "http://127.0.0.1:3000"): string {
  const url = `${baseUrl.replace(/\/+$/, "")}${path.replace(/\{(\w+)\}/g, (_m, name: string) => shellVariable(name))}`;
  const parts: string[] = [`curl -sS`];
  const upper = method.toUpperCase();
  const content = operation.requestBody?.content ?? {};
  const hasBody = Object.keys(content).length > 0;
  if (!(upper === "GET" || (upper === "POST" && hasBody))) parts.push(`-X ${upper}`);
  const schemes = (operation.security ?? []).flatMap((s) => Object.keys(s));
  if (schemes.includes("bearerToken")) parts.push(`-H "Authorization: Bearer $TANKBOOK_TOKEN"`);
  else if (schemes.includes("sessionCookie")) parts.push(`-b "tankbook_session=$SESSION_ID"`);
  if (content["multipart/form-data"]) {
    parts.push(`-H "Idempotency-Key: $(uuidgen)"`, `-F "file=@capture.csv"`);
    for (const [name, value] of Object.entries(UPLOAD_FIELD_EXAMPLES)) parts.push(`-F ${singleQuoted(`${name}=${value}`)}`);
  } else if (content["application/json"]) {
    const example = content["application/json"].example ?? {};
    parts.push(`-H "Content-Type: application/json"`, `-d ${singleQuoted(JSON.stringify(example))}`);
  }
  if (operation.responses?.["302"]) parts.push("-L -o capture.csv");
  else if (path.endsWith(".csv")) parts.push("-o runs.csv");
  else if (path.endsWith(".json") && !path.endsWith("openapi.json")) parts.push("-OJ");
  parts.push(`"${url}"`);
  return parts.join(" \\\n  ");
}
