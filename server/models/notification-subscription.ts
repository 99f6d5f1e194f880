import { DataTypes, type CreationOptional } from "sequelize";
import { sequelize } from "../db/sequelize";
import { TableModel } from "./kit";
import type { NotificationKind } from "../../shared/schemas/notification";

/** A kind of e-mail notification one person has chosen to receive. */
export class NotificationSubscriptionModel extends TableModel<NotificationSubscriptionModel> {
  declare userId: number;
  declare kind: NotificationKind;
  declare createdAt: CreationOptional<Date>;
}

NotificationSubscriptionModel.init(
  {
    userId: { type: DataTypes.INTEGER, primaryKey: true },
    kind: { type: DataTypes.STRING(40), primaryKey: true },
    createdAt: DataTypes.DATE(3),
  },
  { sequelize, tableName: "notification_subscriptions", updatedAt: false },
);
