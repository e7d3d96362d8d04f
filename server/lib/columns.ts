import { DataTypes, type Model } from 'sequelize';

/**
 * Column definitions every model repeats. Kept apart from server/lib/models.ts so that module model
 * files can import them without an import cycle. Each is a function returning a fresh object:
 * Sequelize writes into attribute definitions (field name, model), so one shared object used for
 * two columns would make them collapse into one.
 */

/** `network_id`, first half of every tenant table's composite primary key. */
export const networkIdColumn = () => ({ type: DataTypes.UUID, allowNull: false, primaryKey: true }) as const;

/**
 * `id`, second half of the composite key. Declare it before `networkId` so that Sequelize's single
 * `primaryKeyAttribute` (used as the default join key) is `id`.
 */
export const idColumn = () =>
  ({ type: DataTypes.UUID, allowNull: false, primaryKey: true, defaultValue: DataTypes.UUIDV4 }) as const;

/** A required uuid reference to another row of the same network. */
export const refColumn = () => ({ type: DataTypes.UUID, allowNull: false }) as const;
/** An optional uuid reference to another row of the same network. */
export const optionalRefColumn = () => ({ type: DataTypes.UUID, allowNull: true }) as const;

// pg returns NUMERIC and BIGINT as strings to keep precision; the values here fit a double easily,
// and services should compute with numbers.
function asNumber(this: Model, key: string): number | null {
  const value: unknown = this.getDataValue(key);
  return value == null ? null : Number(value);
}

/** NUMERIC(precision, scale) read back as a JavaScript number. */
export function decimalColumn(key: string, precision: number, scale: number, allowNull = true) {
  return {
    type: DataTypes.DECIMAL(precision, scale),
    allowNull,
    get(this: Model) {
      return asNumber.call(this, key);
    },
  };
}

/** BIGINT read back as a JavaScript number (byte counts stay far below 2^53). */
export function bigintColumn(key: string, allowNull = false) {
  return {
    type: DataTypes.BIGINT,
    allowNull,
    get(this: Model) {
      return asNumber.call(this, key);
    },
  };
}

/** Mirrors a CHECK (column in (...)) so a bad value fails validation before reaching the database. */
export function oneOf(values: readonly string[]) {
  return { isIn: { args: [values as string[]], msg: `must be one of: ${values.join(', ')}` } };
}

/** The owner's hazard tags (shared/safety/hazards.ts), a text[] checked by the database as well. */
export const hazardsColumn = () => ({ type: DataTypes.ARRAY(DataTypes.TEXT), allowNull: false, defaultValue: [] }) as const;
