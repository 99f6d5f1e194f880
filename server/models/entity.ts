import { DataTypes, type CreationOptional } from "sequelize";
import { sequelize } from "../db/sequelize";
import { RowModel, idColumn, notNull, nullable, timestampColumns, versionColumn } from "./kit";
import type { PnlBasis, RegimeId } from "../../shared/schemas/common";

export class EntityModel extends RowModel<EntityModel> {
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
}

EntityModel.init(
  {
    ...idColumn(),
    code: { ...notNull.varchar(20), unique: true },
    name: notNull.varchar(120),
    regime: notNull.oneOf("basel", "us", "eu", "frtb"),
    pnlBasis: notNull.oneOf("actual", "hypothetical", "max"),
    currency: notNull.char(3),
    country: nullable.char(2),
    // DECIMAL comes back as a string: convert here, once.
    qualitativeAddend: {
      type: DataTypes.DECIMAL(6, 4),
      allowNull: false,
      defaultValue: 0,
      get() {
        return Number(this.getDataValue("qualitativeAddend"));
      },
    },
    supervisorName: nullable.varchar(120),
    supervisorEmails: {
      ...notNull.text(),
      get() {
        const raw = this.getDataValue("supervisorEmails") as unknown as string | null;
        return raw ? (JSON.parse(raw) as string[]) : [];
      },
      set(value: string[]) {
        this.setDataValue("supervisorEmails", JSON.stringify(value ?? []) as unknown as string[]);
      },
    },
    ...versionColumn(),
    ...timestampColumns(),
  },
  { sequelize, tableName: "entities" },
);
