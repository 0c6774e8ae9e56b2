import { describe, expect, it } from "vitest";
import { curlExample } from "@/lib/openapi/curl";

const bearer: Record<string, string[]>[] = [{ bearerToken: [] }, { sessionCookie: [] }];

describe("curlExample", () => {
  it("writes_a_get_with_the_token_variable_and_path_variables", () => {
    expect(curlExample("/api/v1/runs/{runId}", "get", { security: bearer }, "http://bench:3000/")).toBe(
      'curl -sS \\\n  -H "Authorization: Bearer $TANKBOOK_TOKEN" \\\n  "http://bench:3000/api/v1/runs/$RUN_ID"',
    );
  });

  it("sends_the_json_example_single_quoted", () => {
    const line = curlExample("/api/v1/projects", "post", { security: bearer, requestBody: { content: { "application/json": { example: { name: "It's" } } } } });
    expect(line).toContain(`-d '{"name":"It'\\''s"}'`);
    expect(line).not.toContain("-X POST");
  });

  it("uploads_a_file_with_an_idempotency_key_for_multipart", () => {
    const line = curlExample("/api/v1/builds/{buildId}/runs", "post", { security: bearer, requestBody: { content: { "multipart/form-data": {} } } });
    expect(line).toContain('-H "Idempotency-Key: $(uuidgen)"');
    expect(line).toContain('-F "file=@capture.csv"');
    expect(line).toContain("$BUILD_ID");
  });

  it("follows_a_redirect_for_downloads_and_uses_the_cookie_for_cookie_only_operations", () => {
    expect(curlExample("/api/v1/runs/{runId}/capture", "get", { security: bearer, responses: { "302": {} } })).toContain("-L -o capture.csv");
    const signOut = curlExample("/api/v1/session", "delete", { security: [{ sessionCookie: [] }] });
    expect(signOut).toContain("-X DELETE");
    expect(signOut).toContain('-b "tankbook_session=$SESSION_ID"');
  });
});
