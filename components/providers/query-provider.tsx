"use client";

import { QueryClient, QueryClientProvider } from "@tanstack/react-query";
import { useState, type ReactNode } from "react";

/**
 * One react-query client per browser tab, for the pages that fetch in the client (the run page, the build's runs).
 * Mounted inside those pages, not in the app shell, so server-only pages carry no client cache.
 */
export function QueryProvider({ children }: { children: ReactNode }) {
  const [client] = useState(
    () =>
      new QueryClient({
        defaultOptions: {
          queries: {
            // Server components already rendered fresh data; refetch on focus so a bench tab left open catches up.
            staleTime: 5_000,
            refetchOnWindowFocus: true,
            retry: (failures, error) => failures < 2 && !(error instanceof HttpError && error.status < 500),
          },
        },
      }),
  );
  return <QueryClientProvider client={client}>{children}</QueryClientProvider>;
}

/** A failed API response, with its status and the problem+json title/detail when there is one. */
export class HttpError extends Error {
  readonly status: number;
  constructor(status: number, message: string) {
    super(message);
    this.name = "HttpError";
    this.status = status;
  }
}

/** GETs JSON from our API, turning problem+json failures into an {@link HttpError} with their sentence. */
export async function fetchJson<T>(url: string, signal?: AbortSignal): Promise<T> {
  const response = await fetch(url, { signal, headers: { accept: "application/json" }, credentials: "same-origin" });
  if (!response.ok) {
    let message = `The server answered ${response.status}.`;
    try {
      const body = (await response.json()) as { detail?: string; title?: string };
      message = body.detail ?? body.title ?? message;
    } catch {
      // Not JSON: keep the status sentence.
    }
    throw new HttpError(response.status, message);
  }
  return (await response.json()) as T;
}
