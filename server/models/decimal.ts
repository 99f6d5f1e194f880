import { DataTypes, type Model } from "sequelize";

/**
 * A DECIMAL attribute read as a number: the driver returns DECIMAL as a string, and it is
 * converted here, once, for every model (money is DECIMAL(20,2), factors DECIMAL(6,4)).
 */
export function decimalAttribute<M extends Model>(
  attribute: string,
  precision: number,
  scale: number,
  options: { allowNull: boolean; field?: string },
) {
  return {
    type: DataTypes.DECIMAL(precision, scale),
    allowNull: options.allowNull,
    ...(options.field ? { field: options.field } : {}),
    get(this: M) {
      const raw = this.getDataValue(attribute as never) as unknown;
      return raw === null || raw === undefined ? null : Number(raw);
    },
  };
}
