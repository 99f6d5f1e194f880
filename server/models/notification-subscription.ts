import { DataTypes } from "sequelize";
import { sequelize } from "../db/sequelize";
import { AddedRowModel, createdAtColumn } from "./kit";
import type { NotificationKind } from "../../shared/schemas/notification";

/** A kind of e-mail notification one person has chosen to receive. */
export class NotificationSubscriptionModel extends AddedRowModel<NotificationSubscriptionModel> {
  declare userId: number;
  declare kind: NotificationKind;
}

NotificationSubscriptionModel.init(
  {
    userId: { type: DataTypes.INTEGER, primaryKey: true },
    kind: { type: DataTypes.STRING(40), primaryKey: true },
    ...createdAtColumn(),
  },
  { sequelize, tableName: "notification_subscriptions", updatedAt: false },
);
