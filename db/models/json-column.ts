import { DataTypes, type Model, type ModelAttributeColumnOptions } from "sequelize";
import { z } from "zod";

/**
 * The one way a JSON column is declared and read. MariaDB keeps JSON as text, and whether the
 * driver hands back the text or the parsed value depends on the query (a model read, a raw
 * query, an include), so every read goes through this getter: text is parsed, then the value is
 * checked against the column's schema, and a row that holds something else fails loudly, naming
 * the table and column, instead of travelling on as the wrong shape. Writes are serialised by
 * Sequelize's JSON type.
 */
export function jsonColumn<Schema extends z.ZodType>(
  table: string,
  column: string,
  schema: Schema,
  options: { allowNull?: boolean; defaultValue?: z.input<Schema> } = {},
): ModelAttributeColumnOptions {
  return {
    type: DataTypes.JSON,
    allowNull: options.allowNull ?? false,
    ...(options.defaultValue === undefined ? {} : { defaultValue: options.defaultValue }),
    get(this: Model) {
      const stored: unknown = this.getDataValue(column);
      // Not selected by this query (Sequelize reads every getter, e.g. in update()): nothing to check.
      if (stored === undefined) return undefined;
      return readJsonValue(table, column, schema, stored, options.allowNull ?? false);
    },
  };
}

/** A JSON column's stored value, parsed and checked (exported for its tests). */
export function readJsonValue<Schema extends z.ZodType>(table: string, column: string, schema: Schema, stored: unknown, allowNull: boolean): z.output<Schema> | null {
  if (stored === null) {
    if (allowNull) return null;
    throw new Error(`${table}.${column} is empty, but the column requires a value.`);
  }
  let value: unknown = stored;
  if (typeof stored === "string") {
    try {
      value = JSON.parse(stored);
    } catch {
      throw new Error(`${table}.${column} does not hold valid JSON.`);
    }
  }
  const checked = schema.safeParse(value);
  if (!checked.success) {
    const problems = checked.error.issues.map((issue) => `${issue.path.join(".") || "(value)"}: ${issue.message}`).join("; ");
    throw new Error(`${table}.${column} holds JSON of an unexpected shape: ${problems}`);
  }
  return checked.data;
}

/** An object with any keys: the guard for columns whose inner shape their own module checks. */
export const jsonObject = z.record(z.string(), z.unknown());
