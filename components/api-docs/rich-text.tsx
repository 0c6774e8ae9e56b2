import { Fragment } from "react";

export interface RichTextProps {
  text: string | undefined;
  className?: string;
  /** Render inside a line of text (a span, no paragraphs), e.g. in a card header's description. */
  inline?: boolean;
}

function spans(text: string) {
  return text.split(/(`[^`]+`|\*\*[^*]+\*\*)/).map((piece, i) =>
    piece.startsWith("`") && piece.endsWith("`") && piece.length > 1 ? (
      <code key={i} className="rounded bg-paper-sunk px-1 font-mono text-[12.5px]">
        {piece.slice(1, -1)}
      </code>
    ) : piece.startsWith("**") && piece.endsWith("**") && piece.length > 3 ? (
      <strong key={i} className="font-semibold text-ink">
        {piece.slice(2, -2)}
      </strong>
    ) : (
      <Fragment key={i}>{piece}</Fragment>
    ),
  );
}

/** The document's descriptions: paragraphs split on blank lines, `code` and **bold** spans; nothing else is interpreted. */
export function RichText({ text, className, inline }: RichTextProps) {
  if (!text) return null;
  if (inline) return <span className={className}>{spans(text.replace(/\n+/g, " "))}</span>;
  return (
    <div className={className}>
      {text.split(/\n{2,}/).map((paragraph, p) => (
        <p key={p} className="mt-1.5 first:mt-0">
          {spans(paragraph)}
        </p>
      ))}
    </div>
  );
}
