import { Table, Td, Th, Tr } from "@/components/ui/data-table";
import { fieldRows, ruleText, typeTokens, type Components, type JsonSchema } from "./json-schema";
import { RichText } from "./rich-text";
import { TypeLabel } from "./type-label";

export interface SchemaFieldsProps {
  schema: JsonSchema;
  components: Components;
  caption: string;
}

/** The fields of a request or response body as a table; a body that is not an object shows its type alone. */
export function SchemaFields({ schema, components, caption }: SchemaFieldsProps) {
  const rows = fieldRows(schema, components);
  if (rows.length === 0) {
    return (
      <p className="text-sm">
        <TypeLabel schema={schema} />
      </p>
    );
  }
  return (
    <Table caption={caption}>
      <thead>
        <tr>
          <Th>Field</Th>
          <Th>Type</Th>
          <Th>Rules</Th>
          <Th className="w-1/2">Meaning</Th>
        </tr>
      </thead>
      <tbody>
        {rows.map((row) => (
          <Tr key={row.name}>
            <Td className="whitespace-nowrap font-mono text-[12.5px]">
              {row.name}
              {row.required ? (
                <span className="ml-1 text-copper" title="required">
                  *
                </span>
              ) : null}
            </Td>
            <Td>
              <TypeLabel schema={row.schema} />
            </Td>
            <Td className="text-xs text-ink-soft">{ruleText(row.schema.anyOf?.find((s) => !s.$ref && s.type !== "null") ?? row.schema)}</Td>
            <Td className="text-ink-soft">
              <RichText text={row.schema.description ?? describeRef(row.schema, components)} />
            </Td>
          </Tr>
        ))}
      </tbody>
    </Table>
  );
}

/** A field that only references a named schema takes that schema's description. */
function describeRef(schema: JsonSchema, components: Components): string | undefined {
  const ref = typeTokens(schema).find((t) => t.ref)?.ref;
  return ref ? components[ref]?.description : undefined;
}
