"use client";

import { Button } from "@/components/ui/button";

/** Opens the browser's print dialog (which also saves as PDF). */
export function PrintButton() {
  return (
    <Button type="button" onClick={() => window.print()} className="no-print">
      Print or save as PDF
    </Button>
  );
}
