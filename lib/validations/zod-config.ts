import { z } from "zod";

// Imported first by the schema files a browser loads (common.ts, auth.ts). In the browser zod would probe for
// eval() (new Function) while building each object schema, to compile a faster parser; the Content-Security-
// Policy forbids eval, so the probe only shows up as a CSP violation report. The interpreted parser is plenty
// for forms. The server keeps the compiled parser.
if (typeof window !== "undefined") z.config({ jitless: true });
