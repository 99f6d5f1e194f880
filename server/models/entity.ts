import { DataTypes, Model, type CreationOptional, type InferAttributes, type InferCreationAttributes } from "sequelize";
import { sequelize } from "../db/sequelize";
import type { PnlBasis, RegimeId } from "../../shared/schemas/common";

export class EntityModel extends Model<InferAttributes<EntityModel>, InferCreationAttributes<EntityModel>> {
  declare id: CreationOptional<number>;
  declare code: string;
  declare name: string;
  declare regime: RegimeId;
  declare pnlBasis: PnlBasis;
  declare currency: string;
  /** Whose public holidays the calendar imports (docs/rules.md#business-days); null until chosen. */
  declare country: string | null;
  declare qualitativeAddend: CreationOptional<number>;
  declare supervisorName: string | null;
  declare supervisorEmails: string[];
  declare version: CreationOptional<number>;
  declare createdAt: CreationOptional<Date>;
  declare updatedAt: CreationOptional<Date>;
}

EntityModel.init(
  {
    id: { type: DataTypes.INTEGER, primaryKey: true, autoIncrement: true },
    code: { type: DataTypes.STRING(20), allowNull: false, unique: true },
    name: { type: DataTypes.STRING(120), allowNull: false },
    regime: { type: DataTypes.ENUM("basel", "us", "eu", "frtb"), allowNull: false },
    pnlBasis: { type: DataTypes.ENUM("actual", "hypothetical", "max"), allowNull: false },
    currency: { type: DataTypes.CHAR(3), allowNull: false },
    country: { type: DataTypes.CHAR(2), allowNull: true },
    // DECIMAL comes back as a string: convert here, once.
    qualitativeAddend: {
      type: DataTypes.DECIMAL(6, 4),
      allowNull: false,
      defaultValue: 0,
      get() {
        return Number(this.getDataValue("qualitativeAddend"));
      },
    },
    supervisorName: { type: DataTypes.STRING(120), allowNull: true },
    supervisorEmails: {
      type: DataTypes.TEXT,
      allowNull: false,
      get() {
        const raw = this.getDataValue("supervisorEmails") as unknown as string | null;
        return raw ? (JSON.parse(raw) as string[]) : [];
      },
      set(value: string[]) {
        this.setDataValue("supervisorEmails", JSON.stringify(value ?? []) as unknown as string[]);
      },
    },
    version: { type: DataTypes.INTEGER, allowNull: false, defaultValue: 1 },
    createdAt: DataTypes.DATE(3),
    updatedAt: DataTypes.DATE(3),
  },
  { sequelize, tableName: "entities" },
);
