import { typeTokens, type JsonSchema } from "./json-schema";

export interface TypeLabelProps {
  schema: JsonSchema | undefined;
}

/** A schema's type in words, named schemas linked to their section further down the page. */
export function TypeLabel({ schema }: TypeLabelProps) {
  return (
    <code className="font-mono text-[12.5px] text-ink">
      {typeTokens(schema).map((t, i) =>
        t.ref ? (
          <a key={i} href={`#schema-${t.ref}`} className="text-copper-dark underline decoration-copper/40 underline-offset-2 hover:decoration-copper">
            {t.text}
          </a>
        ) : (
          <span key={i}>{t.text}</span>
        ),
      )}
    </code>
  );
}
